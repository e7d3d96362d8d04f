import type { JobDetail } from '@shared/jobs/dto';
import { formatInShop } from '../format';

/** This visit's part of the instrument's timeline: stage moves, approvals, photos, with who and when. */
export function JobHistory({ detail }: { detail: JobDetail }) {
  if (!detail.history.length) return <p className="text-ink-600">Nothing recorded yet.</p>;
  return (
    <ol className="flex flex-col gap-3" aria-label="Job history">
      {detail.history.map((h) => (
        <li key={h.id} className="border-l-2 border-accent-200 pl-3">
          <p className="text-ink-950">{h.summary}</p>
          <p className="text-sm text-ink-600">
            <time dateTime={h.occurredAt}>{formatInShop(h.occurredAt, detail.shop.timeZone)}</time>
            {h.userName ? ` · ${h.userName}` : ''}
          </p>
        </li>
      ))}
    </ol>
  );
}
