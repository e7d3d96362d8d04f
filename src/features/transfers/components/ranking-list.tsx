import type { RankedShop } from '@shared/routing/rank';
import { cn } from '@/lib/cn';
import { formatInShop, formatLocalDate } from '../format';

interface RankingListProps {
  ranked: RankedShop[];
  recommendedShopId: string | null;
  selectedShopId: string | null;
  onSelect: (shopId: string) => void;
  name: string;
}

const TRANSPORT: Record<RankedShop['transport'], string> = {
  here: 'Stays here',
  relay_run: 'Relay run',
  road: 'Courier, no relay run',
  none: 'No way to get there',
};

/**
 * The shops that have the skill, soonest finish first, each with the reasons that put it there. A radio
 * group: arrow keys move between shops, and the origin cannot be chosen as a destination.
 */
export function RankingList({ ranked, recommendedShopId, selectedShopId, onSelect, name }: RankingListProps) {
  const first = ranked[0];
  const keepingIsBest = !!first?.isOrigin && !!first.finishDate;
  return (
    <fieldset>
      <legend className="mb-3 text-lg font-semibold text-ink-950">Where it would be finished soonest</legend>
      {keepingIsBest ? (
        <p role="status" className="mb-3 rounded-xl border border-paper-300 bg-paper-50 p-3 text-sm text-ink-800">
          Keeping the job at {first.shopName} finishes it soonest, by {formatLocalDate(first.finishDate)}. Send it only for another
          reason, such as a specialist’s hands.
        </p>
      ) : null}
      <ol className="flex flex-col gap-3">
        {ranked.map((r) => {
          const selectable = !r.isOrigin && !!r.finishDate;
          const id = `${name}-${r.shopId}`;
          return (
            <li
              key={r.shopId}
              className={cn(
                'rounded-2xl border bg-white p-4 sm:p-5',
                selectedShopId === r.shopId ? 'border-accent-600 ring-2 ring-accent-200' : 'border-paper-200',
              )}
            >
              <div className="flex flex-wrap items-start gap-3">
                <input
                  id={id}
                  type="radio"
                  name={name}
                  value={r.shopId}
                  className="mt-1 size-5 accent-accent-600"
                  checked={selectedShopId === r.shopId}
                  disabled={!selectable}
                  onChange={() => onSelect(r.shopId)}
                  aria-describedby={`${id}-reasons`}
                />
                <label htmlFor={id} className="min-w-0 flex-1">
                  <span className="flex flex-wrap items-center gap-2">
                    <span className="text-sm font-semibold text-ink-600">#{r.rank}</span>
                    <span className="text-base font-semibold text-ink-950">{r.shopName}</span>
                    {r.shopId === recommendedShopId ? (
                      <span className="rounded-full bg-accent-600 px-2.5 py-0.5 text-xs font-semibold text-white">
                        {keepingIsBest ? 'Best other shop' : 'Recommended'}
                      </span>
                    ) : null}
                    {r.isOrigin ? <span className="rounded-full bg-paper-200 px-2.5 py-0.5 text-xs font-semibold text-ink-800">This shop</span> : null}
                  </span>
                  <span className="mt-1 block text-sm text-ink-800">
                    {r.finishDate ? (
                      <>
                        Finished by <strong>{formatLocalDate(r.finishDate)}</strong> · {TRANSPORT[r.transport]}
                        {r.arrivalAt ? <> · arrives {formatInShop(r.arrivalAt, r.timeZone)}</> : null}
                      </>
                    ) : (
                      'Cannot be finished there'
                    )}
                  </span>
                </label>
              </div>
              <ul id={`${id}-reasons`} className="mt-3 ml-8 list-disc space-y-1 pl-4 text-sm text-ink-600" aria-label={`Why ${r.shopName}`}>
                {r.reasons.map((reason, i) => (
                  <li key={i}>{reason.text}</li>
                ))}
              </ul>
            </li>
          );
        })}
      </ol>
    </fieldset>
  );
}
