import { useQuery } from '@tanstack/react-query';
import { useId, useState, type KeyboardEvent, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import type { MatchKind } from '@shared/schemas/registry';
import { familyLabel, stageLabel } from '../format';
import { instrumentSearchQueryOptions, type SearchParams } from '../queries';
import type { InstrumentHit } from '../types';
import { useDebouncedValue } from '../use-debounced-value';
import { BarcodeScanner, instrumentIdFromScan } from './barcode-scanner';

const MATCH_LABELS: Record<MatchKind, string> = {
  exact: 'Exact serial',
  asset_tag: 'Asset tag',
  prefix: 'Starts with',
  contains: 'Contains',
  similar: 'Close match',
};

interface InstrumentSearchProps {
  /** Extra filters (family, shop, status) from the page around the box. */
  filters?: Omit<SearchParams, 'q'>;
  query: string;
  onQueryChange: (q: string) => void;
  /** Called with a picked result (click, Enter on the active row). */
  onPick: (hit: InstrumentHit) => void;
  /** A scan of one of our QR labels names an instrument directly. */
  onScannedInstrument?: (instrumentId: string) => void;
  /** Builds a link for each result; without it results are buttons. */
  linkTo?: (hit: InstrumentHit) => string;
  /** Rendered under the results, e.g. "Register a new instrument". */
  footer?: (state: { query: string; results: InstrumentHit[] }) => ReactNode;
  autoFocus?: boolean;
  label?: string;
  /** Search even with no text (a filter-only listing). */
  listWithoutText?: boolean;
}

/**
 * The registry's serial box: answers while typing (debounced), forgiving about case, spaces and
 * punctuation, ranked exact → prefix → near misses. Arrow keys move through the results, Enter picks.
 */
export function InstrumentSearch({
  filters = {}, query, onQueryChange, onPick, onScannedInstrument, linkTo, footer, autoFocus, label = 'Serial number or asset tag',
  listWithoutText = false,
}: InstrumentSearchProps) {
  const inputId = useId();
  const listId = useId();
  const hintId = useId();
  const [active, setActive] = useState(0);
  const debounced = useDebouncedValue(query.trim(), 180);
  const hasFilter = Object.values(filters).some((v) => v !== undefined && v !== '');
  const enabled = debounced.length > 0 || (listWithoutText && hasFilter);
  const search = useQuery({ ...instrumentSearchQueryOptions({ ...filters, q: debounced }), enabled });
  const results = enabled ? (search.data ?? []) : [];
  const typingAhead = query.trim() !== debounced || (search.isFetching && search.isPlaceholderData);

  const onKeyDown = (event: KeyboardEvent<HTMLInputElement>) => {
    if (event.key === 'ArrowDown') {
      event.preventDefault();
      setActive((i) => Math.min(results.length - 1, i + 1));
    } else if (event.key === 'ArrowUp') {
      event.preventDefault();
      setActive((i) => Math.max(0, i - 1));
    } else if (event.key === 'Enter') {
      event.preventDefault();
      const hit = results[Math.min(active, results.length - 1)];
      if (hit && !typingAhead) onPick(hit);
    } else if (event.key === 'Escape') {
      onQueryChange('');
    }
  };

  const onScan = (value: string) => {
    const id = instrumentIdFromScan(value);
    if (id && onScannedInstrument) onScannedInstrument(id);
    else onQueryChange(value);
  };

  return (
    <div className="flex flex-col gap-3">
      <label htmlFor={inputId} className="text-sm font-semibold text-ink-950">
        {label}
      </label>
      <div className="flex flex-col gap-3 sm:flex-row sm:items-start">
        <div className="relative flex-1">
          <input
            id={inputId}
            type="search"
            role="combobox"
            aria-expanded={results.length > 0}
            aria-controls={listId}
            aria-autocomplete="list"
            aria-describedby={hintId}
            aria-activedescendant={results.length ? `${listId}-${Math.min(active, results.length - 1)}` : undefined}
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            // eslint-disable-next-line jsx-a11y/no-autofocus -- only where the screen exists to type a serial (the registry search, the intake's first step)
            autoFocus={autoFocus}
            value={query}
            onChange={(event) => {
              onQueryChange(event.target.value);
              setActive(0);
            }}
            onKeyDown={onKeyDown}
            placeholder="e.g. AB-104 233"
            className="min-h-12 w-full rounded-lg border border-paper-300 bg-white px-4 text-lg font-semibold tracking-wide text-ink-950 placeholder:font-normal placeholder:text-ink-400 hover:border-ink-400"
          />
          {typingAhead ? <Spinner className="absolute top-3 right-3" label="Searching…" /> : null}
        </div>
        <BarcodeScanner onDetected={onScan} />
      </div>
      <p id={hintId} className="text-sm text-ink-600">
        Case, spaces, dashes and dots do not matter; a near miss still finds it. ↑ ↓ to move, Enter to pick.
      </p>

      {search.isError ? (
        <ErrorState title="The registry could not be searched" error={search.error} onRetry={() => void search.refetch()} />
      ) : null}

      <div aria-live="polite" className="sr-only">
        {enabled && search.isSuccess ? `${results.length} ${results.length === 1 ? 'instrument' : 'instruments'} found` : ''}
      </div>

      {enabled && search.isSuccess && results.length === 0 && !typingAhead ? (
        <p className="rounded-xl border border-dashed border-paper-300 bg-paper-50 px-4 py-6 text-center text-ink-600">
          No instrument in the network matches “{debounced}”.
        </p>
      ) : null}

      <ul id={listId} role="listbox" aria-label="Matching instruments" className={cn('flex flex-col gap-2', results.length === 0 && 'hidden')}>
        {results.map((hit, index) => {
          const selected = index === Math.min(active, results.length - 1);
          const body = <ResultBody hit={hit} />;
          const classes = cn(
            'block w-full rounded-xl border bg-white px-4 py-3 text-left hover:border-accent-600',
            selected ? 'border-accent-600 ring-2 ring-accent-100' : 'border-paper-200',
          );
          return (
            <li key={hit.id} id={`${listId}-${index}`} role="option" aria-selected={selected} onMouseEnter={() => setActive(index)}>
              {linkTo ? (
                <Link to={linkTo(hit)} className={classes}>
                  {body}
                </Link>
              ) : (
                <button type="button" className={classes} tabIndex={-1} onClick={() => onPick(hit)}>
                  {body}
                </button>
              )}
            </li>
          );
        })}
      </ul>
      {footer ? footer({ query: debounced, results }) : null}
    </div>
  );
}

function ResultBody({ hit }: { hit: InstrumentHit }) {
  return (
    <span className="flex flex-col gap-1 sm:flex-row sm:items-baseline sm:justify-between sm:gap-4">
      <span className="flex flex-col gap-0.5">
        <span className="flex flex-wrap items-baseline gap-2">
          <span className="font-mono text-base font-bold tracking-wide text-ink-950">{hit.serial}</span>
          {hit.match ? (
            <span className="rounded-full bg-paper-100 px-2 py-0.5 text-xs font-semibold text-ink-800">{MATCH_LABELS[hit.match]}</span>
          ) : null}
        </span>
        <span className="text-sm text-ink-800">
          {familyLabel(hit.family)} · {hit.maker}
          {hit.model ? ` ${hit.model}` : ''}
          {hit.assetTag ? <span className="text-ink-600"> · tag {hit.assetTag}</span> : null}
        </span>
      </span>
      <span className="flex flex-col text-sm sm:items-end">
        <span className="text-ink-800">At {hit.currentShop.name}</span>
        {hit.openJob ? (
          <span className="font-semibold text-accent-800">
            Job {hit.openJob.number} · {stageLabel(hit.openJob.stage)}
            {hit.openJob.shopId !== hit.currentShop.id ? ` at ${hit.openJob.shopName}` : ''}
          </span>
        ) : (
          <span className="text-ink-600">No open job</span>
        )}
      </span>
    </span>
  );
}
