import { forwardRef, type AnchorHTMLAttributes, type ButtonHTMLAttributes } from 'react';
import { Link, type LinkProps } from 'react-router-dom';
import { cn } from '@/lib/cn';

export type ButtonVariant = 'primary' | 'secondary' | 'quiet';
export type ButtonSize = 'md' | 'lg';

// 44px minimum height (48px for lg) keeps every control comfortable for a thumb at the bench.
const base =
  'inline-flex items-center justify-center gap-2 rounded-lg font-semibold transition-colors ' +
  'disabled:cursor-not-allowed disabled:opacity-60 select-none';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-accent-600 text-white hover:bg-accent-700 active:bg-accent-800',
  secondary: 'border border-paper-300 bg-white text-ink-950 hover:bg-paper-50 hover:border-ink-400',
  quiet: 'text-ink-800 hover:bg-paper-200 hover:text-ink-950',
};

const sizes: Record<ButtonSize, string> = {
  md: 'min-h-11 px-4 text-sm',
  lg: 'min-h-12 px-6 text-base',
};

export function buttonClasses(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', className?: string) {
  return cn(base, variants[variant], sizes[size], className);
}

interface StyleProps {
  variant?: ButtonVariant;
  size?: ButtonSize;
}

export const Button = forwardRef<HTMLButtonElement, ButtonHTMLAttributes<HTMLButtonElement> & StyleProps>(
  function Button({ variant, size, className, type = 'button', ...props }, ref) {
    return <button ref={ref} type={type} className={buttonClasses(variant, size, className)} {...props} />;
  },
);

/** A router link that looks like a button (for in-app navigation). */
export function ButtonLink({ variant, size, className, ...props }: LinkProps & StyleProps) {
  return <Link className={buttonClasses(variant, size, className)} {...props} />;
}

/**
 * A plain anchor that looks like a button, for addresses the server handles (such as /auth/login),
 * which must be a full page load rather than a client-side route change.
 */
export function ButtonAnchor({ variant, size, className, children, ...props }: AnchorHTMLAttributes<HTMLAnchorElement> & StyleProps) {
  return (
    <a className={buttonClasses(variant, size, className)} {...props}>
      {children}
    </a>
  );
}
