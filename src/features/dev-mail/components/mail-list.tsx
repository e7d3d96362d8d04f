import { Link } from 'react-router-dom';
import { cn } from '@/lib/cn';
import { formatReceivedAt } from '../format';
import type { CaughtMessage } from '../queries';

interface MailListProps {
  messages: CaughtMessage[];
  selectedId?: string;
  /** Builds the address that opens one message. */
  hrefFor: (id: string) => string;
}

export function MailList({ messages, selectedId, hrefFor }: MailListProps) {
  return (
    <ul className="flex flex-col divide-y divide-paper-200 overflow-hidden rounded-2xl border border-paper-200 bg-white">
      {messages.map((message) => {
        const selected = message.id === selectedId;
        return (
          <li key={message.id}>
            <Link
              to={hrefFor(message.id)}
              aria-current={selected ? 'true' : undefined}
              className={cn(
                'flex min-h-16 flex-col gap-1 px-4 py-3 -outline-offset-2 hover:bg-paper-50',
                selected && 'bg-accent-50 hover:bg-accent-50',
              )}
            >
              <span className="font-semibold text-ink-950">{message.subject || '(no subject)'}</span>
              <span className="truncate text-sm text-ink-800">To {message.to.join(', ')}</span>
              <span className="text-xs text-ink-600">
                <time dateTime={message.receivedAt}>{formatReceivedAt(message.receivedAt)}</time>
              </span>
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
