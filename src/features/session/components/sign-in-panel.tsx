import { ButtonAnchor } from '@/components/ui/button';
import { signInHref } from '../queries';

interface SignInPanelProps {
  /** Where to come back to after signing in; only in-app paths are kept. */
  returnTo?: string | null;
}

export function SignInPanel({ returnTo }: SignInPanelProps) {
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">Sign in to Benchrelay</h1>
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
