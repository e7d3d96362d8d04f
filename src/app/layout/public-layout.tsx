import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { Brand } from './brand';
import { DevMailLink } from './dev-mail-link';
import { MAIN_CONTENT_ID, SkipLink } from './skip-link';

interface PublicLayoutProps {
  children: ReactNode;
  /** Narrow puts the content in one centred card (sign-in, no access); wide gives a page to tools. */
  width?: 'narrow' | 'wide';
}

/** The frame for screens that do not need a signed-in member: sign-in, no access, development tools. */
export function PublicLayout({ children, width = 'narrow' }: PublicLayoutProps) {
  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <header className="border-b border-paper-200 bg-white">
        <div className="mx-auto flex max-w-page items-center px-4 py-3 sm:px-6">
          <Brand />
        </div>
      </header>
      <main
        id={MAIN_CONTENT_ID}
        tabIndex={-1}
        className={cn(
          'mx-auto w-full flex-1 px-4 py-8 outline-none sm:px-6 sm:py-12',
          width === 'narrow' ? 'max-w-xl' : 'max-w-page',
        )}
      >
        {width === 'narrow' ? (
          <div className="rounded-2xl border border-paper-200 bg-white p-6 shadow-[0_1px_2px_rgb(28_32_36/0.05)] sm:p-10">
            {children}
          </div>
        ) : (
          children
        )}
      </main>
      <footer className="mx-auto w-full max-w-page px-4 pb-6 sm:px-6">
        <DevMailLink />
      </footer>
    </div>
  );
}
