import { Link } from 'react-router-dom';
import { formatDistanceToNowStrict } from 'date-fns';
import { NOTIFICATION_KIND_LABELS } from '@shared/domain';
import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { formatDateTime, viewerTimeZone } from '@shared/time/format';
import type { Notice } from '../types';

interface NoticeListProps {
  notices: Notice[];
  /** Turns a notice's stored path into the link to follow (adds the current shop where it has none). */
  hrefFor: (link: string) => string;
  onRead: (id: string) => void;
  /** The notice being marked read just now, to disable its button. */
  pendingId?: string;
}

/** Newest first; unread ones carry a bar, a bold title and an explicit "Unread" for screen readers. */
export function NoticeList({ notices, hrefFor, onRead, pendingId }: NoticeListProps) {
  return (
    <ul className="flex flex-col gap-3" aria-label="Notices">
      {notices.map((n) => {
        const unread = !n.readAt;
        const when = new Date(n.createdAt);
        return (
          <li
            key={n.id}
            className={cn(
              'flex flex-col gap-3 rounded-xl border bg-white px-4 py-3 sm:flex-row sm:items-start sm:justify-between',
              unread ? 'border-accent-200 border-l-4 border-l-accent-600' : 'border-paper-200',
            )}
            data-testid="notice"
            data-unread={unread ? 'true' : 'false'}
          >
            <div className="min-w-0 flex-1">
              <p className="text-xs font-semibold uppercase tracking-wide text-ink-600">
                {unread ? <span className="sr-only">Unread: </span> : null}
                {NOTIFICATION_KIND_LABELS[n.kind].label}
                <span aria-hidden="true"> · </span>
                <time dateTime={n.createdAt} title={formatDateTime(when, viewerTimeZone())} className="font-normal normal-case tracking-normal">
                  {formatDistanceToNowStrict(when, { addSuffix: true })}
                </time>
              </p>
              <h2 className={cn('mt-1 text-base text-ink-950', unread ? 'font-bold' : 'font-medium')}>
                {n.link ? (
                  <Link
                    to={hrefFor(n.link)}
                    className="underline decoration-paper-300 underline-offset-4 hover:decoration-ink-800"
                    onClick={() => {
                      if (unread) onRead(n.id);
                    }}
                  >
                    {n.title}
                  </Link>
                ) : (
                  n.title
                )}
              </h2>
              {n.body ? <p className="mt-1 break-words text-sm text-ink-800">{n.body}</p> : null}
            </div>
            {unread ? (
              <Button variant="secondary" className="shrink-0 self-start" onClick={() => onRead(n.id)} disabled={pendingId === n.id}>
                Mark read<span className="sr-only">: {n.title}</span>
              </Button>
            ) : (
              <p className="shrink-0 self-start text-sm text-ink-600">Read</p>
            )}
          </li>
        );
      })}
    </ul>
  );
}
