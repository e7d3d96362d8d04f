import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { devMailQueryOptions } from '@/features/dev-mail/queries';
import { cn } from '@/lib/cn';

/**
 * The built client cannot tell development from production by itself (the same bundle runs in both),
 * so the link appears only when the server's development mail endpoint answers.
 */
export function DevMailLink({ className }: { className?: string }) {
  const probe = useQuery({ ...devMailQueryOptions(), retry: false, staleTime: Infinity, refetchOnWindowFocus: false });
  if (!probe.isSuccess) return null;
  return (
    <p className={cn('text-sm text-ink-600', className)}>
      <span className="font-semibold uppercase tracking-wide text-xs">Development</span>{' '}
      <span aria-hidden="true">·</span>{' '}
      <Link to="/dev/mail" className="font-medium text-accent-700 underline underline-offset-2 hover:text-accent-800">
        Caught e-mail
      </Link>
    </p>
  );
}
