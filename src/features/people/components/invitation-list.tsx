import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { FormMessage } from '@/components/ui/form-field';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/form-errors';
import { describeRole, formatDateTime, invitationStatusLabels } from '../format';
import { invitationsQueryOptions, useResendInvitation, useRevokeInvitation } from '../queries';

/** Invitations not yet accepted: send again (a new link) or withdraw. */
export function InvitationList() {
  const invitations = useQuery(invitationsQueryOptions());
  const resend = useResendInvitation();
  const revoke = useRevokeInvitation();
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);

  if (invitations.isPending) return <Spinner label="Loading invitations…" showLabel />;
  if (invitations.isError) {
    return <ErrorState title="Invitations could not be loaded" error={invitations.error} onRetry={() => void invitations.refetch()} />;
  }
  if (invitations.data.length === 0) return null;

  return (
    <section aria-labelledby="invitations-heading" className="flex flex-col gap-4">
      <h2 id="invitations-heading" className="text-xl font-semibold text-ink-950">
        Open invitations
      </h2>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      <ul className="flex flex-col divide-y divide-paper-200 rounded-2xl border border-paper-200 bg-white">
        {invitations.data.map((inv) => (
          <li key={inv.id} className="flex flex-col gap-3 px-4 py-4 sm:flex-row sm:items-center sm:justify-between sm:px-6">
            <div className="min-w-0">
              <p className="font-semibold break-all text-ink-950">{inv.email}</p>
              <p className="text-sm text-ink-800">{inv.roles.map((r) => describeRole(r.role, r.shopName)).join(' · ')}</p>
              <p className="text-sm text-ink-600">
                {invitationStatusLabels[inv.status]}
                {inv.status === 'pending' ? ` · link works until ${formatDateTime(inv.expiresAt)}` : ''}
              </p>
            </div>
            <div className="flex gap-2">
              <Button
                variant="secondary"
                disabled={resend.isPending}
                onClick={() =>
                  resend.mutate(inv.id, {
                    onSuccess: (r) =>
                      setMessage(
                        r.mailed
                          ? { tone: 'success', text: `A new link went to ${inv.email}.` }
                          : { tone: 'error', text: `The invitation was renewed, but the e-mail to ${inv.email} could not be sent.` },
                      ),
                    onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
                  })
                }
              >
                Send again
              </Button>
              <Button
                variant="quiet"
                disabled={revoke.isPending}
                onClick={() =>
                  revoke.mutate(inv.id, {
                    onSuccess: () => setMessage({ tone: 'success', text: `The invitation to ${inv.email} was withdrawn.` }),
                    onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
                  })
                }
              >
                Withdraw
              </Button>
            </div>
          </li>
        ))}
      </ul>
    </section>
  );
}
