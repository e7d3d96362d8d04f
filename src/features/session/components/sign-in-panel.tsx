import { ButtonAnchor } from '@/components/ui/button';
import { signInHref } from '../queries';

interface SignInPanelProps {
  /** Where to come back to after signing in; only in-app paths are kept. */
  returnTo?: string | null;
  /** Why the last sign-in did not go through (`/sign-in?error=…`, set by the server's callback). */
  problem?: string | null;
}

/** What each `error` of `/sign-in?error=…` means, in plain words. */
export const SIGN_IN_PROBLEMS: Record<string, { title: string; text: string }> = {
  identity_mismatch: {
    title: 'You were not signed in',
    text:
      'This e-mail address belongs to someone who signs in to Benchrelay with a different account. ' +
      'Sign in with the account you used before. If your sign-in provider signs you straight back in ' +
      'with the wrong account, sign out there first. If your account has changed, ask your network’s owner.',
  },
  email_unverified: {
    title: 'Your e-mail address is not confirmed yet',
    text:
      'Your sign-in provider has not confirmed that this e-mail address is yours, so Benchrelay cannot ' +
      'link it to you. Confirm the address with your provider, then sign in again.',
  },
  expired: {
    title: 'The sign-in took too long',
    text: 'The sign-in was started too long ago or in another tab. Sign in again.',
  },
  failed: {
    title: 'The sign-in did not finish',
    text: 'The sign-in provider did not complete the sign-in. Try again; if it keeps failing, ask your network’s owner.',
  },
};

export function SignInPanel({ returnTo, problem }: SignInPanelProps) {
  const shown = problem ? (SIGN_IN_PROBLEMS[problem] ?? SIGN_IN_PROBLEMS.failed) : undefined;
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">Sign in to Benchrelay</h1>
      {shown ? (
        <div role="alert" className="rounded-xl border border-danger-200 bg-danger-50 p-4 text-ink-950">
          <p className="font-semibold">{shown.title}</p>
          <p>{shown.text}</p>
        </div>
      ) : null}
      <p className="text-lg leading-relaxed text-ink-800">
        Benchrelay gives your network of band-instrument repair shops one instrument registry, a job board for
        every bench, and transfers that carry each repair to the shop best placed to finish it.
      </p>
      {/* A full page load on purpose: the server sends the browser on to the identity provider. */}
      <ButtonAnchor href={signInHref(returnTo)} size="lg" className="w-full sm:w-auto sm:self-start">
        Sign in
      </ButtonAnchor>
      <p className="text-sm text-ink-600">You sign in with the account your network uses; Benchrelay keeps no passwords.</p>
    </div>
  );
}
