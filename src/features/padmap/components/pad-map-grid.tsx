import { memo, useCallback, useId, useRef, useSyncExternalStore, type KeyboardEvent } from 'react';
import type { Finding, KeyResult } from '@shared/padmap/compute';
import type { MeasureField } from '@shared/padmap/entries';
import { FLOOR_LABELS, FLOOR_SHAPES, PAD_KIND_LABELS, PAD_KINDS, type FloorShape, type PadKind } from '@shared/padmap/rules';
import type { KeySuggestion } from '@shared/padmap/suggest';
import { formatInches, formatMm, parseLength, type LengthUnit } from '@shared/padmap/units';
import { cn } from '@/lib/cn';
import type { GridRow, Preview } from '../pad-map-form';

/** Columns the keyboard moves through, in the order a technician reads them off the caliper. */
const COLUMNS = ['cupDiameter', 'cupDepth', 'rimDiameter', 'floor', 'padKind'] as const;
const MEASURES: Array<{ field: MeasureField; label: string }> = [
  { field: 'cupDiameter', label: 'cup diameter' },
  { field: 'cupDepth', label: 'cup depth' },
  { field: 'rimDiameter', label: 'tone-hole rim diameter' },
];

interface PadMapGridProps {
  rows: GridRow[];
  unit: LengthUnit;
  preview: Preview;
  /** Field errors the server sent back, by row index. */
  serverErrors: Record<number, Partial<Record<string, string>>>;
  suggestions: Record<string, KeySuggestion> | null;
  readOnly: boolean;
  onChange: (index: number, patch: Partial<GridRow>) => void;
  onRemove: (index: number) => void;
}

const severityStyle: Record<Finding['severity'], string> = {
  error: 'text-danger-700 font-semibold',
  warning: 'text-[#8a5300] font-semibold',
  info: 'text-ink-600',
};
const severityWord: Record<Finding['severity'], string> = { error: 'Error', warning: 'Warning', info: 'Note' };

const mm = (value: number | null, decimals = 2) => (value == null ? '—' : formatMm(value, decimals));

/** The other unit of a typed reading, so both are always in view (1 in = 25.4 mm exactly). */
function otherUnit(text: string, unit: LengthUnit): string | null {
  if (!text.trim()) return null;
  const parsed = parseLength(text, unit);
  if (!parsed.ok) return null;
  return parsed.unit === 'in' ? formatMm(parsed.mm, 3) : formatInches(parsed.mm);
}

/**
 * The key-by-key table. Built for the keyboard: Tab walks along a row, Enter (or ↓) goes down the
 * same column like a spreadsheet, Shift+Enter (or ↑) goes up. Units may be typed inline (`1.200in`,
 * `30.5mm`); a bare number is in the map's unit. Each warning sits under the cell that causes it.
 */
/** The table needs a desktop's width; below it each key is a card with its readings and its result together. */
const WIDE_QUERY = '(min-width: 1280px)';

function subscribeWide(onChange: () => void) {
  if (typeof window === 'undefined' || !window.matchMedia) return () => {};
  const list = window.matchMedia(WIDE_QUERY);
  list.addEventListener('change', onChange);
  return () => list.removeEventListener('change', onChange);
}
// without matchMedia (tests in jsdom, printing) the table is shown
const isWide = () => (typeof window === 'undefined' || !window.matchMedia ? true : window.matchMedia(WIDE_QUERY).matches);

export function useWideScreen(): boolean {
  return useSyncExternalStore(subscribeWide, isWide, () => true);
}

export function PadMapGrid({ rows, unit, preview, serverErrors, suggestions, readOnly, onChange, onRemove }: PadMapGridProps) {
  const tableRef = useRef<HTMLDivElement>(null);
  const idBase = useId();
  const wide = useWideScreen();

  const focusCell = useCallback((row: number, column: number) => {
    const target = tableRef.current?.querySelector<HTMLInputElement | HTMLSelectElement>(`[data-cell="${row}:${column}"]`);
    if (!target) return false;
    target.focus();
    if (target instanceof HTMLInputElement) target.select();
    return true;
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLElement>) => {
    const cell = (event.target as HTMLElement).dataset.cell;
    if (!cell) return;
    const [row, column] = cell.split(':').map(Number);
    const isSelect = event.target instanceof HTMLSelectElement;
    let step = 0;
    if (event.key === 'Enter') step = event.shiftKey ? -1 : 1;
    // arrows change a closed select's value, so they only move between text cells
    else if (!isSelect && event.key === 'ArrowDown') step = 1;
    else if (!isSelect && event.key === 'ArrowUp') step = -1;
    if (!step) return;
    event.preventDefault();
    focusCell(row + step, column);
  };

  if (!wide) {
    return (
      // eslint-disable-next-line jsx-a11y/no-noninteractive-element-interactions -- Enter and the arrows pressed in a card's fields bubble up here to move between keys
      <div ref={tableRef} className="flex flex-col gap-3" onKeyDown={onKeyDown} role="list" aria-label="Pad map, one card per key">
        {rows.map((row, index) => (
          <KeyCard
            key={row.keyId}
            index={index}
            idBase={idBase}
            row={row}
            unit={unit}
            result={preview.result.keys[index]}
            readingErrors={preview.errors[index] ?? NONE}
            serverErrors={serverErrors[index] ?? NONE}
            suggestion={suggestions?.[row.keyId]}
            readOnly={readOnly}
            onChange={onChange}
            onRemove={onRemove}
          />
        ))}
      </div>
    );
  }

  return (
    <div ref={tableRef} className="overflow-x-auto rounded-2xl border border-paper-200 bg-white" data-print="sheet">
      {/* eslint-disable-next-line jsx-a11y/no-noninteractive-element-interactions -- Enter and the arrows pressed in a cell's field bubble up here to move between rows */}
      <table className="w-full border-collapse text-left text-sm" onKeyDown={onKeyDown}>
        <caption className="sr-only">
          Pad map, one row per key. Enter moves down a column, Shift+Enter moves up; type units inline, such as 1.200in or 30.5mm.
        </caption>
        <thead className="border-b border-paper-200 bg-paper-50 text-xs uppercase tracking-wide text-ink-600">
          <tr>
            <th scope="col" className="sticky left-0 z-10 bg-paper-50 px-3 py-2 font-semibold">Key</th>
            <th scope="col" className="px-2 py-2 font-semibold">Cup Ø</th>
            <th scope="col" className="px-2 py-2 font-semibold">Depth</th>
            <th scope="col" className="px-2 py-2 font-semibold">Rim Ø</th>
            <th scope="col" className="px-2 py-2 font-semibold">Floor</th>
            <th scope="col" className="px-2 py-2 font-semibold">Pad kind</th>
            <th scope="col" className="border-l border-paper-200 px-2 py-2 font-semibold">Pad Ø</th>
            <th scope="col" className="px-2 py-2 font-semibold">Clearance / side</th>
            <th scope="col" className="px-2 py-2 font-semibold">Rim overlap / side</th>
            <th scope="col" className="px-2 py-2 font-semibold">Stem</th>
            <th scope="col" className="px-2 py-2 font-semibold">Face above rim</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-200">
          {rows.map((row, index) => (
            <GridRowView
              key={row.keyId}
              index={index}
              idBase={idBase}
              row={row}
              unit={unit}
              result={preview.result.keys[index]}
              readingErrors={preview.errors[index] ?? NONE}
              serverErrors={serverErrors[index] ?? NONE}
              suggestion={suggestions?.[row.keyId]}
              readOnly={readOnly}
              onChange={onChange}
              onRemove={onRemove}
            />
          ))}
        </tbody>
      </table>
    </div>
  );
}

const NONE: Partial<Record<string, string>> = Object.freeze({});

interface GridRowViewProps {
  index: number;
  idBase: string;
  row: GridRow;
  unit: LengthUnit;
  result: KeyResult | undefined;
  readingErrors: Partial<Record<string, string>>;
  serverErrors: Partial<Record<string, string>>;
  suggestion: KeySuggestion | undefined;
  readOnly: boolean;
  onChange: (index: number, patch: Partial<GridRow>) => void;
  onRemove: (index: number) => void;
}

/** One key's row; memoised so typing in one row does not redraw the other two dozen. */
const GridRowView = memo(function GridRowView({ index, idBase, row, unit, result, readingErrors, serverErrors, suggestion, readOnly, onChange, onRemove }: GridRowViewProps) {
  const fromServer = serverErrors;
  const status = readingErrors.cupDiameter || readingErrors.cupDepth || readingErrors.rimDiameter ? 'error' : (result?.status ?? 'empty');
  const rowLabel = row.keyName || 'New key';
  const cellId = (field: string) => `${idBase}-${index}-${field}`;
  const messagesFor = (field: MeasureField) => {
    const list: Array<{ severity: Finding['severity']; message: string }> = [];
    const reading = readingErrors[field] ?? fromServer[field];
    if (reading) list.push({ severity: 'error', message: reading });
    else for (const f of result?.findings ?? []) if (f.field === field) list.push(f);
    return list;
  };
  return (
    <tr
      data-status={status}
      className={cn(
        'align-top',
        status === 'error' && 'bg-danger-50/60',
        status === 'warning' && 'bg-[#fff8e6]',
        status === 'empty' && row.optional && 'text-ink-600',
      )}
    >
      <th scope="row" className="sticky left-0 z-10 min-w-28 bg-inherit px-2 py-2 font-semibold text-ink-950">
        {row.custom ? (
          <div className="flex items-center gap-1">
            <input
              aria-label={`Name of added key ${index + 1}`}
              value={row.keyName}
              readOnly={readOnly}
              onChange={(e) => onChange(index, { keyName: e.target.value })}
              placeholder="Key name"
              className="min-h-10 w-32 rounded-md border border-paper-300 px-2"
              aria-invalid={fromServer.keyName ? true : undefined}
              aria-describedby={fromServer.keyName ? cellId('keyName') : undefined}
            />
            {!readOnly ? (
              <button type="button" data-print="hide" className="min-h-10 rounded-md px-2 text-ink-600 hover:bg-paper-200" onClick={() => onRemove(index)} aria-label={`Remove ${rowLabel}`}>
                ×
              </button>
            ) : null}
          </div>
        ) : (
          <span>
            {row.keyName}
            {row.optional ? <span className="ml-1 text-xs font-normal text-ink-600">(if fitted)</span> : null}
          </span>
        )}
        {fromServer.keyName ? <p id={cellId('keyName')} className="mt-1 text-xs text-danger-700">{fromServer.keyName}</p> : null}
        {suggestion?.padDiameterMm != null ? (
          <p className="mt-1 text-xs font-normal text-ink-600">
            Network: {formatMm(suggestion.padDiameterMm, 1)} pad · {suggestion.basedOn} {suggestion.basedOn === 1 ? 'map' : 'maps'}
          </p>
        ) : null}
      </th>
      {MEASURES.map(({ field, label }, column) => {
        const messages = messagesFor(field);
        const conversion = otherUnit(row[field], unit);
        const describedBy = [conversion ? cellId(`${field}-conv`) : null, messages.length ? cellId(field) : null].filter(Boolean).join(' ');
        return (
          <td key={field} className="px-2 py-2">
            <input
              data-cell={`${index}:${column}`}
              aria-label={`${rowLabel} ${label}`}
              value={row[field]}
              readOnly={readOnly}
              inputMode="decimal"
              autoComplete="off"
              spellCheck={false}
              onChange={(e) => onChange(index, { [field]: e.target.value })}
              aria-invalid={messages.some((m) => m.severity === 'error') ? true : undefined}
              aria-describedby={describedBy || undefined}
              className={cn(
                'min-h-10 w-20 rounded-md border bg-white px-2 tabular-nums',
                messages.some((m) => m.severity === 'error') ? 'border-danger-700' : 'border-paper-300',
              )}
            />
            {conversion ? (
              <p id={cellId(`${field}-conv`)} className="mt-0.5 text-xs tabular-nums text-ink-600">= {conversion}</p>
            ) : null}
            {messages.length ? (
              <ul id={cellId(field)} className="mt-1 max-w-44 space-y-1 text-xs">
                {messages.map((m, i) => (
                  <li key={i} className={severityStyle[m.severity]}>
                    <span className="sr-only">{severityWord[m.severity]}: </span>
                    {m.message}
                  </li>
                ))}
              </ul>
            ) : null}
          </td>
        );
      })}
      <td className="px-2 py-2">
        <select
          data-cell={`${index}:${COLUMNS.indexOf('floor')}`}
          aria-label={`${rowLabel} floor`}
          value={row.floor}
          disabled={readOnly}
          onChange={(e) => onChange(index, { floor: e.target.value as FloorShape })}
          className="min-h-10 rounded-md border border-paper-300 bg-white px-2"
        >
          {FLOOR_SHAPES.map((f) => (
            <option key={f} value={f}>{FLOOR_LABELS[f]}</option>
          ))}
        </select>
      </td>
      <td className="px-2 py-2">
        <select
          data-cell={`${index}:${COLUMNS.indexOf('padKind')}`}
          aria-label={`${rowLabel} pad kind`}
          value={row.padKind}
          disabled={readOnly}
          onChange={(e) => onChange(index, { padKind: e.target.value as PadKind })}
          className="min-h-10 rounded-md border border-paper-300 bg-white px-2"
        >
          {PAD_KINDS.map((k) => (
            <option key={k} value={k}>{PAD_KIND_LABELS[k]}</option>
          ))}
        </select>
      </td>
      <td className="border-l border-paper-200 px-2 py-2 tabular-nums" data-result="pad">
        {result?.padDiameterMm != null ? (
          <>
            <span className="font-semibold text-ink-950">{formatMm(result.padDiameterMm, 1)}</span>
            <span className="block text-xs text-ink-600">{formatInches(result.padDiameterMm)}</span>
            {result.padThicknessMm != null ? <span className="block text-xs text-ink-600">× {formatMm(result.padThicknessMm, 1)} thick</span> : null}
          </>
        ) : (
          <span className="text-ink-600">—</span>
        )}
      </td>
      <td className="px-1.5 py-2 tabular-nums">
        {mm(result?.radialClearanceMm ?? null)}
        {result?.radialClearanceMm != null && result.radialClearanceMm < 0 ? <span className="block text-xs text-ink-600">press fit</span> : null}
      </td>
      <td className="px-1.5 py-2 tabular-nums">{mm(result?.rimOverlapMm ?? null)}</td>
      <td className="px-1.5 py-2 tabular-nums font-semibold">{result?.stemHeightMm != null ? formatMm(result.stemHeightMm, 1) : '—'}</td>
      <td className="px-1.5 py-2 tabular-nums">{mm(result?.protrusionMm ?? null)}</td>
    </tr>
  );
});

/** Shared by the row and the card: what a reading's cell says under it. */
function useKeyMessages(row: GridRow, result: KeyResult | undefined, readingErrors: Partial<Record<string, string>>, serverErrors: Partial<Record<string, string>>) {
  const status = readingErrors.cupDiameter || readingErrors.cupDepth || readingErrors.rimDiameter ? 'error' : (result?.status ?? 'empty');
  const messagesFor = (field: MeasureField) => {
    const list: Array<{ severity: Finding['severity']; message: string }> = [];
    const reading = readingErrors[field] ?? serverErrors[field];
    if (reading) list.push({ severity: 'error', message: reading });
    else for (const f of result?.findings ?? []) if (f.field === field) list.push(f);
    return list;
  };
  return { status, messagesFor };
}

const STATUS_WORDS: Record<string, string> = { ok: 'Fits', warning: 'Check the warnings', error: 'Needs a fix', empty: 'Not measured' };

/** One key on a phone or tablet: its three readings, its floor and pad kind, and what Benchrelay computes from them. */
const KeyCard = memo(function KeyCard({ index, idBase, row, unit, result, readingErrors, serverErrors, suggestion, readOnly, onChange, onRemove }: GridRowViewProps) {
  const { status, messagesFor } = useKeyMessages(row, result, readingErrors, serverErrors);
  const rowLabel = row.keyName || 'New key';
  const cellId = (field: string) => `${idBase}-${index}-${field}`;
  return (
    <article
      role="listitem"
      aria-labelledby={cellId('name')}
      data-status={status}
      data-key-card={row.keyId}
      className={cn(
        'flex flex-col gap-3 rounded-2xl border bg-white p-4',
        status === 'error' ? 'border-danger-200 bg-danger-50/60' : status === 'warning' ? 'border-[#f0c36d] bg-[#fff8e6]' : 'border-paper-200',
      )}
    >
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0">
          {row.custom ? (
            <div className="flex items-center gap-1">
              <input
                aria-label={`Name of added key ${index + 1}`}
                value={row.keyName}
                readOnly={readOnly}
                onChange={(e) => onChange(index, { keyName: e.target.value })}
                placeholder="Key name"
                className="min-h-11 w-40 rounded-md border border-paper-300 px-2"
                aria-invalid={serverErrors.keyName ? true : undefined}
              />
              {!readOnly ? (
                <button type="button" className="min-h-11 min-w-11 rounded-md px-2 text-ink-600 hover:bg-paper-200" onClick={() => onRemove(index)} aria-label={`Remove ${rowLabel}`}>
                  ×
                </button>
              ) : null}
            </div>
          ) : null}
          <h3 id={cellId('name')} className={cn('font-semibold text-ink-950', row.custom && 'sr-only')}>
            {rowLabel}
            {row.optional ? <span className="ml-1 text-xs font-normal text-ink-600">(if fitted)</span> : null}
          </h3>
          {serverErrors.keyName ? <p className="mt-1 text-xs text-danger-700">{serverErrors.keyName}</p> : null}
          {suggestion?.padDiameterMm != null ? (
            <p className="text-xs text-ink-600">
              Network: {formatMm(suggestion.padDiameterMm, 1)} pad · {suggestion.basedOn} {suggestion.basedOn === 1 ? 'map' : 'maps'}
            </p>
          ) : null}
        </div>
        <span className="rounded-full bg-white/80 px-2 py-0.5 text-xs font-semibold text-ink-800">{STATUS_WORDS[status] ?? ''}</span>
      </header>

      <div className="grid grid-cols-3 gap-2">
        {MEASURES.map(({ field, label }, column) => {
          const messages = messagesFor(field);
          const conversion = otherUnit(row[field], unit);
          const describedBy = [conversion ? cellId(`${field}-conv`) : null, messages.length ? cellId(field) : null].filter(Boolean).join(' ');
          const invalid = messages.some((m) => m.severity === 'error');
          return (
            <div key={field} className="flex min-w-0 flex-col gap-1">
              <span aria-hidden="true" className="text-xs font-semibold text-ink-600">{SHORT_LABELS[field]}</span>
              <input
                data-cell={`${index}:${column}`}
                aria-label={`${rowLabel} ${label}`}
                value={row[field]}
                readOnly={readOnly}
                inputMode="decimal"
                autoComplete="off"
                spellCheck={false}
                onChange={(e) => onChange(index, { [field]: e.target.value })}
                aria-invalid={invalid ? true : undefined}
                aria-describedby={describedBy || undefined}
                className={cn('min-h-11 w-full min-w-0 rounded-md border bg-white px-2 tabular-nums', invalid ? 'border-danger-700' : 'border-paper-300')}
              />
              {conversion ? <p id={cellId(`${field}-conv`)} className="text-xs tabular-nums text-ink-600">= {conversion}</p> : null}
              {messages.length ? (
                <ul id={cellId(field)} className="space-y-1 text-xs break-words">
                  {messages.map((m, i) => (
                    <li key={i} className={severityStyle[m.severity]}>
                      <span className="sr-only">{severityWord[m.severity]}: </span>
                      {m.message}
                    </li>
                  ))}
                </ul>
              ) : null}
            </div>
          );
        })}
      </div>

      <div className="grid grid-cols-2 gap-2">
        <label className="flex min-w-0 flex-col gap-1 text-xs font-semibold text-ink-600">
          Floor
          <select
            data-cell={`${index}:${COLUMNS.indexOf('floor')}`}
            aria-label={`${rowLabel} floor`}
            value={row.floor}
            disabled={readOnly}
            onChange={(e) => onChange(index, { floor: e.target.value as FloorShape })}
            className="min-h-11 w-full min-w-0 rounded-md border border-paper-300 bg-white px-2 text-sm font-normal text-ink-950"
          >
            {FLOOR_SHAPES.map((f) => (
              <option key={f} value={f}>{FLOOR_LABELS[f]}</option>
            ))}
          </select>
        </label>
        <label className="flex min-w-0 flex-col gap-1 text-xs font-semibold text-ink-600">
          Pad kind
          <select
            data-cell={`${index}:${COLUMNS.indexOf('padKind')}`}
            aria-label={`${rowLabel} pad kind`}
            value={row.padKind}
            disabled={readOnly}
            onChange={(e) => onChange(index, { padKind: e.target.value as PadKind })}
            className="min-h-11 w-full min-w-0 rounded-md border border-paper-300 bg-white px-2 text-sm font-normal text-ink-950"
          >
            {PAD_KINDS.map((k) => (
              <option key={k} value={k}>{PAD_KIND_LABELS[k]}</option>
            ))}
          </select>
        </label>
      </div>

      <dl data-result="pad" aria-label={`${rowLabel} result`} className="grid grid-cols-2 gap-x-3 gap-y-1 rounded-xl bg-paper-50 px-3 py-2 text-sm tabular-nums sm:grid-cols-5">
        <div>
          <dt className="text-xs text-ink-600">Pad Ø</dt>
          <dd className="font-semibold text-ink-950">
            {result?.padDiameterMm != null ? (
              <>
                {formatMm(result.padDiameterMm, 1)} <span className="text-xs font-normal text-ink-600">{formatInches(result.padDiameterMm)}</span>
                {result.padThicknessMm != null ? <span className="block text-xs font-normal text-ink-600">× {formatMm(result.padThicknessMm, 1)} thick</span> : null}
              </>
            ) : '—'}
          </dd>
        </div>
        <div>
          <dt className="text-xs text-ink-600">Clearance / side</dt>
          <dd>
            {mm(result?.radialClearanceMm ?? null)}
            {result?.radialClearanceMm != null && result.radialClearanceMm < 0 ? <span className="block text-xs text-ink-600">press fit</span> : null}
          </dd>
        </div>
        <div>
          <dt className="text-xs text-ink-600">Rim overlap / side</dt>
          <dd>{mm(result?.rimOverlapMm ?? null)}</dd>
        </div>
        <div>
          <dt className="text-xs text-ink-600">Stem</dt>
          <dd className="font-semibold">{result?.stemHeightMm != null ? formatMm(result.stemHeightMm, 1) : '—'}</dd>
        </div>
        <div>
          <dt className="text-xs text-ink-600">Face above rim</dt>
          <dd>{mm(result?.protrusionMm ?? null)}</dd>
        </div>
      </dl>
    </article>
  );
});

const SHORT_LABELS: Record<MeasureField, string> = { cupDiameter: 'Cup Ø', cupDepth: 'Depth', rimDiameter: 'Rim Ø' };
