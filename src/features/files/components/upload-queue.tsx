import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import type { UploadItem } from '../upload';

const STATE_TEXT: Record<UploadItem['state'], string> = {
  starting: 'Preparing…',
  uploading: 'Uploading',
  confirming: 'Checking…',
  done: 'Saved',
  failed: 'Not sent',
  refused: 'Refused',
};

/** Uploads in flight, each with its progress bar; failed ones can be retried with one tap. */
export function UploadQueue({ items, onRetry, onDismiss }: { items: UploadItem[]; onRetry: (id: string) => void; onDismiss: (id: string) => void }) {
  if (!items.length) return null;
  return (
    <ul aria-label="Uploads" className="flex flex-col gap-2">
      {items.map((item) => {
        const percent = Math.round(item.progress * 100);
        return (
          <li
            key={item.localId}
            className={cn(
              'flex flex-col gap-2 rounded-xl border p-3',
              item.state === 'failed' || item.state === 'refused' ? 'border-danger-200 bg-danger-50' : 'border-paper-200 bg-white',
            )}
          >
            <div className="flex items-center justify-between gap-3 text-sm">
              <span className="min-w-0 truncate font-semibold text-ink-950">
                {item.kind === 'photo' ? `${item.tag ?? ''} photo` : item.caption || 'Document'} · {item.file.name}
              </span>
              <span className="shrink-0 text-ink-800" aria-live="polite">
                {STATE_TEXT[item.state]}
                {item.state === 'uploading' ? ` ${percent} %` : ''}
              </span>
            </div>
            {item.state === 'uploading' || item.state === 'confirming' || item.state === 'starting' ? (
              <progress
                className="h-2 w-full overflow-hidden rounded-full accent-accent-600"
                max={100}
                value={item.state === 'starting' ? undefined : percent}
                aria-label={`Upload of ${item.file.name}`}
              />
            ) : null}
            {item.message ? <p className="text-sm text-danger-700">{item.message}</p> : null}
            {item.state === 'failed' || item.state === 'refused' ? (
              <div className="flex gap-2">
                {item.state === 'failed' ? (
                  <Button size="lg" className="flex-1" onClick={() => onRetry(item.localId)}>
                    Retry upload
                  </Button>
                ) : null}
                <Button variant="secondary" size="lg" onClick={() => onDismiss(item.localId)}>
                  Dismiss
                </Button>
              </div>
            ) : null}
          </li>
        );
      })}
    </ul>
  );
}
