import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

interface EmptyStateProps {
  title: string;
  children?: ReactNode;
  action?: ReactNode;
  className?: string;
}

export function EmptyState({ title, children, action, className }: EmptyStateProps) {
  return (
    <div
      className={cn(
        'flex flex-col items-center gap-3 rounded-2xl border border-dashed border-paper-300 bg-paper-50 px-6 py-12 text-center',
        className,
      )}
    >
      <svg className="size-10 text-ink-400" viewBox="0 0 40 40" fill="none" aria-hidden="true">
        <circle cx="20" cy="20" r="13" stroke="currentColor" strokeWidth="2.5" />
        <circle cx="20" cy="20" r="4" stroke="currentColor" strokeWidth="2.5" />
      </svg>
      <h2 className="text-lg font-semibold text-ink-950">{title}</h2>
      {children ? <div className="max-w-prose text-ink-600">{children}</div> : null}
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
