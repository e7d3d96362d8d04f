import { useState } from 'react';
import { Card } from '@/components/ui/card';
import { cn } from '@/lib/cn';
import { formatReceivedAt, framedMailDocument, splitLinks } from '../format';
import type { CaughtMessage } from '../queries';

type View = 'text' | 'html';

export function MailReader({ message }: { message: CaughtMessage }) {
  const html = message.html ?? '';
  const text = message.text ?? '';
  const hasHtml = html.trim().length > 0;
  const hasText = text.trim().length > 0;
  const [view, setView] = useState<View>(hasText || !hasHtml ? 'text' : 'html');

  return (
    <Card as="article" aria-labelledby="mail-subject" className="flex flex-col gap-5">
      <header className="flex flex-col gap-3">
        <h2 id="mail-subject" className="text-xl font-semibold text-ink-950">
          {message.subject || '(no subject)'}
        </h2>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-600">From</dt>
          <dd className="break-all text-ink-950">{message.from}</dd>
          <dt className="text-ink-600">To</dt>
          <dd className="break-all text-ink-950">{message.to.join(', ')}</dd>
          <dt className="text-ink-600">Received</dt>
          <dd className="text-ink-950">
            <time dateTime={message.receivedAt}>{formatReceivedAt(message.receivedAt)}</time>
          </dd>
        </dl>
      </header>

      {hasHtml ? (
        <div className="flex gap-2" role="group" aria-label="Show the message as">
          {(['text', 'html'] as const).map((option) => (
            <button
              key={option}
              type="button"
              aria-pressed={view === option}
              onClick={() => setView(option)}
              className={cn(
                'min-h-11 rounded-lg border px-4 text-sm font-semibold',
                view === option
                  ? 'border-accent-600 bg-accent-50 text-accent-800'
                  : 'border-paper-300 bg-white text-ink-800 hover:bg-paper-50',
              )}
            >
              {option === 'text' ? 'Text' : 'HTML'}
            </button>
          ))}
        </div>
      ) : null}

      {view === 'text' ? (
        <pre className="font-sans text-base leading-relaxed whitespace-pre-wrap break-words text-ink-950">
          {hasText
            ? splitLinks(text).map((part, index) =>
                part.kind === 'link' ? (
                  <a key={index} href={part.value} target="_blank" rel="noreferrer" className="font-medium text-accent-700 underline underline-offset-2">
                    {part.value}
                  </a>
                ) : (
                  <span key={index}>{part.value}</span>
                ),
              )
            : '(this message has no plain-text part)'}
        </pre>
      ) : (
        // A sandbox without scripts, forms or this page's origin; links may only open a new tab
        // (its own browsing context, outside the sandbox), never load anything inside the frame.
        <iframe
          title={`HTML version of “${message.subject || 'no subject'}”`}
          sandbox="allow-popups allow-popups-to-escape-sandbox"
          srcDoc={framedMailDocument(html)}
          className="h-[60vh] w-full rounded-lg border border-paper-200 bg-white"
        />
      )}
    </Card>
  );
}
