import { describeRole, formatDateTime } from '../format';
import type { InvitationPreview } from '../types';

/** What an invitation offers, in the words the person will see in the app afterwards. */
export function InvitationSummary({ invitation }: { invitation: InvitationPreview }) {
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">Join {invitation.networkName}</h1>
      <p className="text-lg leading-relaxed text-ink-800">
        {invitation.invitedByName ? `${invitation.invitedByName} invites you` : 'You are invited'} to work in{' '}
        <strong className="font-semibold text-ink-950">{invitation.networkName}</strong> on Benchrelay as:
      </p>
      <ul className="flex flex-col gap-2">
        {invitation.roles.map((r, i) => (
          <li key={i} className="rounded-lg border border-paper-200 bg-paper-50 px-4 py-3 font-semibold text-ink-950">
            {describeRole(r.role, r.shopName)}
          </li>
        ))}
      </ul>
      <p className="text-ink-800">
        The invitation is for <strong className="font-semibold break-all text-ink-950">{invitation.email}</strong>. Sign in with that
        address; the link works once, until {formatDateTime(invitation.expiresAt)}.
      </p>
    </div>
  );
}
