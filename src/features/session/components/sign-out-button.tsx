import { Button, type ButtonVariant } from '@/components/ui/button';
import { useSignOut } from '../queries';

interface SignOutButtonProps {
  variant?: ButtonVariant;
  className?: string;
}

export function SignOutButton({ variant = 'secondary', className }: SignOutButtonProps) {
  const signOut = useSignOut();
  return (
    <div className={className}>
      <Button variant={variant} onClick={() => signOut.mutate()} disabled={signOut.isPending || signOut.isSuccess}>
        {signOut.isPending || signOut.isSuccess ? 'Signing out…' : 'Sign out'}
      </Button>
      {signOut.isError ? (
        <p role="alert" className="mt-2 text-sm text-danger-700">
          Signing out did not work: {signOut.error.message}
        </p>
      ) : null}
    </div>
  );
}
