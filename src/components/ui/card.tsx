import type { HTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

interface CardProps extends HTMLAttributes<HTMLElement> {
  as?: 'div' | 'section' | 'article' | 'li';
}

export function Card({ as: Element = 'div', className, ...props }: CardProps) {
  return (
    <Element
      className={cn('rounded-2xl border border-paper-200 bg-white p-5 shadow-[0_1px_2px_rgb(28_32_36/0.05)] sm:p-6', className)}
      {...props}
    />
  );
}

export function CardTitle({ className, children, ...props }: HTMLAttributes<HTMLHeadingElement>) {
  return (
    <h2 className={cn('text-lg font-semibold text-ink-950', className)} {...props}>
      {children}
    </h2>
  );
}
