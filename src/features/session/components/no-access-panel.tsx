import { SignOutButton } from './sign-out-button';

interface NoAccessPanelProps {
  email?: string;
}

export function NoAccessPanel({ email }: NoAccessPanelProps) {
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">No access yet</h1>
      <p className="text-lg leading-relaxed text-ink-800">
        {email ? (
          <>
            You are signed in as <strong className="font-semibold break-all text-ink-950">{email}</strong>, but this
            e-mail has no role in any shop yet.
          </>
        ) : (
          <>You are signed in, but this e-mail has no role in any shop yet.</>
        )}
      </p>
      <p className="leading-relaxed text-ink-800">
        Ask your network&rsquo;s owner to send an invitation to this address. Once you accept it, sign in again and
        your shops will be here.
      </p>
      <SignOutButton variant="primary" />
    </div>
  );
}
