import { useQuery, useQueryClient } from '@tanstack/react-query';
import Papa from 'papaparse';
import { useId, useMemo, useState, type ChangeEvent } from 'react';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { isApiError } from '@/lib/api-client';
import { HELD_ELSEWHERE_MESSAGE, IMPORT_FIELDS, type ImportRowResult } from '@shared/schemas/registry';
import {
  applyMapping,
  autoMapColumns,
  checkRows,
  chunk,
  fieldLabel,
  missingRequired,
  type ColumnMapping,
  type MappedRow,
} from '../import-mapping';
import { customerSearchQueryOptions, registryKeys, registryMutations } from '../queries';
import type { ImportBatchResult } from '../types';
import { useDebouncedValue } from '../use-debounced-value';
import { SelectField, TextField } from './fields';

const BATCH_SIZE = 200;
const PREVIEW_ROWS = 8;

interface ParsedFile {
  name: string;
  headers: string[];
  rows: Array<Record<string, unknown>>;
  parseErrors: string[];
}

type Owner = { kind: 'rental_fleet' } | { kind: 'school' | 'customer'; customerId: string; name: string };

interface FleetImportProps {
  shop: { id: string; name: string };
}

/**
 * A school's or the rental fleet's instruments from a CSV file: choose the file, say whose they are,
 * map the columns, look at a preview with the problems found, then import in batches with a progress
 * bar. Importing the same file again updates what changed and creates nothing twice.
 */
export function FleetImport({ shop }: FleetImportProps) {
  const queryClient = useQueryClient();
  const fileId = useId();
  const [file, setFile] = useState<ParsedFile | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [owner, setOwner] = useState<Owner>({ kind: 'rental_fleet' });
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);
  const [outcome, setOutcome] = useState<{ results: ImportRowResult[]; counts: ImportBatchResult['counts'] } | null>(null);
  const [failure, setFailure] = useState<unknown>(null);
  const [check, setCheck] = useState<{ state: 'running' } | { state: 'done'; result: ImportBatchResult } | { state: 'failed'; error: unknown } | null>(null);

  const mapped: MappedRow[] = useMemo(() => (file && mapping ? applyMapping(file.rows, mapping) : []), [file, mapping]);
  const problems = useMemo(() => checkRows(mapped), [mapped]);
  const missing = mapping ? missingRequired(mapping) : [];
  const running = progress !== null && progress.done < progress.total && !failure;

  const onFile = (event: ChangeEvent<HTMLInputElement>) => {
    const chosen = event.target.files?.[0];
    setOutcome(null);
    setFailure(null);
    setProgress(null);
    setReadError(null);
    setCheck(null);
    if (!chosen) return;
    Papa.parse<Record<string, unknown>>(chosen, {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (h) => h.trim(),
      complete: (result) => {
        const headers = (result.meta.fields ?? []).filter(Boolean);
        if (!headers.length) {
          setReadError('The file has no header row. The first line must name the columns (for example Serial, Maker, Instrument).');
          return;
        }
        setFile({
          name: chosen.name,
          headers,
          rows: result.data,
          parseErrors: result.errors.slice(0, 5).map((e) => `Row ${(e.row ?? 0) + 2}: ${e.message}`),
        });
        setMapping(autoMapColumns(headers));
      },
      error: () => setReadError('The file could not be read. Save it as CSV (comma-separated values) and try again.'),
    });
  };

  const emptyCounts = (): ImportBatchResult['counts'] => ({ created: 0, updated: 0, unchanged: 0, held_elsewhere: 0, error: 0 });
  const batchInput = (rows: MappedRow[], dryRun: boolean) => ({
    shopId: shop.id,
    ownerKind: owner.kind,
    ownerCustomerId: owner.kind === 'rental_fleet' ? undefined : owner.customerId,
    rows,
    dryRun,
  });

  /** The preview's check against the registry: what each row would do, nothing written. */
  const runCheck = async () => {
    setCheck({ state: 'running' });
    const results: ImportRowResult[] = [];
    const counts = emptyCounts();
    try {
      for (const batch of chunk(mapped, BATCH_SIZE)) {
        const answer = await registryMutations.importBatch(batchInput(batch, true));
        results.push(...answer.results);
        for (const key of Object.keys(counts) as Array<keyof typeof counts>) counts[key] += answer.counts[key];
      }
      setCheck({ state: 'done', result: { results, counts, dryRun: true } });
    } catch (error) {
      setCheck({ state: 'failed', error });
    }
  };

  const runImport = async () => {
    if (!file || !mapping) return;
    const batches = chunk(mapped, BATCH_SIZE);
    const results: ImportRowResult[] = [];
    const counts = emptyCounts();
    setFailure(null);
    setOutcome(null);
    setProgress({ done: 0, total: mapped.length });
    try {
      for (const batch of batches) {
        const answer = await registryMutations.importBatch(batchInput(batch, false));
        results.push(...answer.results);
        for (const key of Object.keys(counts) as Array<keyof typeof counts>) counts[key] += answer.counts[key];
        setProgress((p) => ({ done: (p?.done ?? 0) + batch.length, total: mapped.length }));
      }
      setOutcome({ results, counts });
    } catch (error) {
      // the batches already sent are in; sending the file again finishes the rest without doubling
      setFailure(error);
      setOutcome({ results, counts });
    } finally {
      await queryClient.invalidateQueries({ queryKey: registryKeys.all });
    }
  };

  const errorRows = outcome?.results.filter((r) => r.outcome === 'error') ?? [];
  const heldRows = outcome?.results.filter((r) => r.outcome === 'held_elsewhere') ?? [];

  return (
    <div className="flex flex-col gap-6">
      <Card as="section" aria-labelledby="file-heading" className="flex flex-col gap-4">
        <CardTitle id="file-heading">1. The file</CardTitle>
        <div className="flex flex-col gap-1">
          <label htmlFor={fileId} className="text-sm font-semibold text-ink-950">CSV file from the school or the rental desk</label>
          <input id={fileId} type="file" accept=".csv,text/csv" onChange={onFile} disabled={running} className="min-h-11 text-sm file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-paper-300 file:bg-white file:px-4 file:font-semibold" />
          <p className="text-sm text-ink-600">The first row names the columns. Registered at {shop.name}; instruments already known keep their shop.</p>
        </div>
        {readError ? <p role="alert" className="font-semibold text-danger-700">{readError}</p> : null}
        {file ? (
          <p className="text-sm text-ink-800">
            {file.name}: {file.rows.length} rows, columns {file.headers.join(', ')}.
          </p>
        ) : null}
        {file?.parseErrors.length ? (
          <ul className="list-disc pl-5 text-sm text-danger-700">
            {file.parseErrors.map((e) => <li key={e}>{e}</li>)}
          </ul>
        ) : null}
      </Card>

      {file && mapping ? (
        <>
          <Card as="section" aria-labelledby="owner-heading" className="flex flex-col gap-4">
            <CardTitle id="owner-heading">2. Whose instruments</CardTitle>
            <OwnerPicker value={owner} onChange={(o) => { setOwner(o); setCheck(null); }} disabled={running} />
          </Card>

          <Card as="section" aria-labelledby="mapping-heading" className="flex flex-col gap-4">
            <CardTitle id="mapping-heading">3. Columns</CardTitle>
            <div className="grid grid-cols-1 gap-4 sm:grid-cols-2 lg:grid-cols-3">
              {IMPORT_FIELDS.map((field) => (
                <SelectField
                  key={field.key}
                  label={field.label}
                  required={field.required}
                  value={mapping[field.key] ?? ''}
                  disabled={running}
                  onChange={(e) => {
                    setMapping({ ...mapping, [field.key]: e.target.value || null });
                    setCheck(null);
                  }}
                >
                  <option value="">— not in the file —</option>
                  {file.headers.map((h) => <option key={h} value={h}>{h}</option>)}
                </SelectField>
              ))}
            </div>
            {missing.length ? <p role="alert" className="font-semibold text-danger-700">Choose a column for: {missing.join(', ')}.</p> : null}
          </Card>

          {!missing.length ? (
            <Card as="section" aria-labelledby="preview-heading" className="flex flex-col gap-4">
              <CardTitle id="preview-heading">4. Preview</CardTitle>
              <div className="overflow-x-auto">
                <table className="w-full min-w-[36rem] text-left text-sm">
                  <caption className="sr-only">The first rows as they will be registered</caption>
                  <thead className="border-b border-paper-200 text-ink-600">
                    <tr>
                      <th scope="col" className="px-2 py-2">Row</th>
                      {IMPORT_FIELDS.filter((f) => mapping[f.key]).map((f) => <th key={f.key} scope="col" className="px-2 py-2">{f.label}</th>)}
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-paper-200">
                    {mapped.slice(0, PREVIEW_ROWS).map((r) => (
                      <tr key={r.row}>
                        <td className="px-2 py-2 tabular-nums text-ink-600">{r.row}</td>
                        {IMPORT_FIELDS.filter((f) => mapping[f.key]).map((f) => <td key={f.key} className="px-2 py-2">{r[f.key] ?? ''}</td>)}
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              <p className="text-ink-800">
                {mapped.length - problems.length} of {mapped.length} rows look ready.
                {problems.length ? ` ${problems.length} need attention and will be reported, not imported:` : ''}
              </p>
              {problems.length ? <ProblemList rows={problems.slice(0, 20).map((p) => ({ row: p.row, errors: p.errors }))} /> : null}
              <div className="flex flex-col gap-2">
                <Button variant="secondary" className="self-start" onClick={() => void runCheck()} disabled={running || check?.state === 'running' || mapped.length === 0}>
                  {check?.state === 'running' ? 'Checking…' : 'Check against the registry'}
                </Button>
                {check?.state === 'done' ? (
                  <>
                    <p className="text-ink-800">
                      The import would register {check.result.counts.created} new and update {check.result.counts.updated}; {check.result.counts.unchanged} are
                      already up to date, {check.result.counts.held_elsewhere} are held by another shop and would not be changed, {check.result.counts.error} have errors.
                    </p>
                    <HeldList rows={check.result.results.filter((r) => r.outcome === 'held_elsewhere')} />
                  </>
                ) : null}
                {check?.state === 'failed' ? <ErrorState title="The rows could not be checked" error={check.error} onRetry={() => void runCheck()} /> : null}
              </div>
              <div className="flex flex-col gap-3">
                <Button size="lg" className="self-start" onClick={() => void runImport()} disabled={running || mapped.length === 0}>
                  {running ? 'Importing…' : outcome ? 'Import the file again' : `Import ${mapped.length} rows`}
                </Button>
                {progress ? (
                  <div className="flex flex-col gap-1">
                    <div
                      role="progressbar"
                      aria-label="Import progress"
                      aria-valuemin={0}
                      aria-valuemax={progress.total}
                      aria-valuenow={progress.done}
                      className="h-3 w-full overflow-hidden rounded-full bg-paper-200"
                    >
                      <div className="h-full bg-accent-600 transition-[width]" style={{ width: `${progress.total ? (progress.done / progress.total) * 100 : 0}%` }} />
                    </div>
                    <p className="text-sm text-ink-600">{progress.done} of {progress.total} rows sent</p>
                  </div>
                ) : null}
              </div>
            </Card>
          ) : null}
        </>
      ) : null}

      {failure ? (
        <ErrorState
          title="The import stopped part-way"
          error={failure}
          onRetry={() => void runImport()}
        />
      ) : null}
      {failure && isApiError(failure) && Object.keys(failure.fieldErrors).length ? (
        <ul className="list-disc pl-5 text-sm text-danger-700">
          {Object.entries(failure.fieldErrors).map(([k, m]) => <li key={k}>{m}</li>)}
        </ul>
      ) : null}

      {outcome && !failure ? (
        <Card as="section" aria-labelledby="result-heading" className="flex flex-col gap-3">
          <CardTitle id="result-heading">Import finished</CardTitle>
          <p className="text-ink-950">
            {outcome.counts.created} new, {outcome.counts.updated} updated, {outcome.counts.unchanged} already up to date,{' '}
            {outcome.counts.held_elsewhere} held by another shop and not changed, {outcome.counts.error} with errors.
          </p>
          <HeldList rows={heldRows} />
          {errorRows.length ? <ProblemList rows={errorRows.map((r) => ({ row: r.row, errors: r.errors ?? {} }))} /> : null}
        </Card>
      ) : null}
    </div>
  );
}

/** Rows naming an instrument another shop holds: reported, never changed. */
function HeldList({ rows }: { rows: ImportRowResult[] }) {
  if (!rows.length) return null;
  return (
    <ul aria-label="Rows held by another shop" className="flex flex-col gap-1 text-sm">
      {rows.slice(0, 50).map((r) => (
        <li key={r.row} className="rounded-lg bg-paper-100 px-3 py-1.5 text-ink-950">
          <strong>Row {r.row}</strong>: {r.message ?? HELD_ELSEWHERE_MESSAGE}{r.heldBy ? ` (${r.heldBy.name})` : ''}
        </li>
      ))}
    </ul>
  );
}

function ProblemList({ rows }: { rows: Array<{ row: number; errors: Record<string, string> }> }) {
  return (
    <ul aria-label="Rows with problems" className="flex flex-col gap-1 text-sm">
      {rows.flatMap((r) =>
        Object.entries(r.errors).map(([field, message]) => (
          <li key={`${r.row}:${field}`} className="rounded-lg bg-danger-50 px-3 py-1.5 text-ink-950">
            <strong>Row {r.row}</strong>, {fieldLabel(field)}: {message}
          </li>
        )),
      )}
    </ul>
  );
}

function OwnerPicker({ value, onChange, disabled }: { value: Owner; onChange: (o: Owner) => void; disabled: boolean }) {
  const [q, setQ] = useState('');
  const debounced = useDebouncedValue(q.trim(), 200);
  const search = useQuery({ ...customerSearchQueryOptions(debounced), enabled: debounced.length >= 2 });
  return (
    <div className="flex flex-col gap-3">
      <fieldset className="flex flex-col gap-2" disabled={disabled}>
        <legend className="text-sm font-semibold text-ink-950">Owner</legend>
        <label className="flex min-h-11 items-center gap-3">
          <input type="radio" name="import-owner" className="size-4 accent-accent-600" checked={value.kind === 'rental_fleet'} onChange={() => onChange({ kind: 'rental_fleet' })} />
          Our rental fleet
        </label>
        {value.kind !== 'rental_fleet' ? (
          <p className="font-semibold text-ink-950">Owner: {value.name}</p>
        ) : null}
      </fieldset>
      <TextField label="Or a school or customer of your shops" type="search" value={q} onChange={(e) => setQ(e.target.value)} disabled={disabled} hint="Type at least two letters of the name." />
      {search.data?.length ? (
        <ul className="flex flex-col gap-2">
          {search.data.map((c) => (
            <li key={c.id}>
              <Button
                variant={value.kind !== 'rental_fleet' && value.customerId === c.id ? 'primary' : 'secondary'}
                onClick={() => onChange({ kind: c.kind === 'school' ? 'school' : 'customer', customerId: c.id, name: c.name ?? 'Private customer' })}
                disabled={disabled}
              >
                {c.name ?? 'Private customer'}
              </Button>
            </li>
          ))}
        </ul>
      ) : debounced.length >= 2 && search.isSuccess ? (
        <p className="text-ink-600">No school or customer of your shops matches “{debounced}”.</p>
      ) : null}
    </div>
  );
}
