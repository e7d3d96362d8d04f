import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { PAD_KIND_LABELS, PAD_KINDS, type PadKind } from '@shared/padmap/rules';
import { formatMm } from '@shared/padmap/units';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { usePadMapForm, rowsToSave } from '../pad-map-form';
import { padMapWorkspaceQueryOptions, useRequestParts, useSavePadMap } from '../queries';
import type { PadMapWorkspace, ReservedLine } from '../types';
import { InstallChecklist } from './install-checklist';
import { PadMapGrid } from './pad-map-grid';
import { PartsSummary } from './parts-summary';
import { formatDate, viewerTimeZone } from '@shared/time/format';
import '../print.css';

interface PadMapScreenProps {
  jobId: string;
  /** Where "Pad rules" links to for the owner; absent for everyone else. */
  rulesHref?: string;
  jobHref?: string;
}

export function PadMapScreen({ jobId, rulesHref, jobHref }: PadMapScreenProps) {
  const workspace = useQuery(padMapWorkspaceQueryOptions(jobId));
  useDocumentTitle(workspace.data ? `Pad map · Job ${workspace.data.job.number}` : 'Pad map');

  if (workspace.isPending) return <PageSpinner label="Loading the pad map…" />;
  if (workspace.isError) {
    const missing = isApiError(workspace.error) && workspace.error.status === 404;
    return (
      <ErrorState
        title={missing ? 'No such job' : 'The pad map could not be loaded'}
        error={workspace.error}
        onRetry={missing ? undefined : () => void workspace.refetch()}
        retrying={workspace.isFetching}
      />
    );
  }
  // a fresh form per job: the key is the job, not the data, so saving does not reset the typing
  return <PadMapEditor key={jobId} ws={workspace.data} rulesHref={rulesHref} jobHref={jobHref} />;
}

function PadMapEditor({ ws, rulesHref, jobHref }: { ws: PadMapWorkspace; rulesHref?: string; jobHref?: string }) {
  const form = usePadMapForm(ws);
  const save = useSavePadMap(ws.job.id);
  const request = useRequestParts(ws.job.id);
  const [serverErrors, setServerErrors] = useState<Record<number, Record<string, string>>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [kindForAll, setKindForAll] = useState<PadKind>(form.rows[0]?.padKind ?? 'self_leveling');
  const readOnly = !ws.can.edit;
  const { result } = form.preview;
  const keyNames = useMemo(() => new Map(form.rows.map((r) => [r.keyId, r.keyName || r.keyId])), [form.rows]);
  const readingErrors = Object.values(form.preview.errors).reduce((n, e) => n + Object.keys(e).length, 0);

  const submit = async (event?: FormEvent) => {
    event?.preventDefault();
    if (readOnly || save.isPending) return;
    const sent = rowsToSave(form.rows);
    setFormError(null);
    try {
      await save.mutateAsync({ unitSystem: form.unit, entries: sent.map((s) => s.row), catalogItemId: form.serviceId });
      setServerErrors({});
      form.markSaved();
    } catch (error) {
      if (isApiError(error)) {
        const byRow: Record<number, Record<string, string>> = {};
        for (const [path, message] of Object.entries(error.fieldErrors)) {
          const match = /^entries\.(\d+)\.(\w+)$/.exec(path);
          if (!match) continue;
          const row = sent[Number(match[1])]?.index;
          if (row != null) (byRow[row] ??= {})[match[2]] = message;
        }
        setServerErrors(byRow);
        setFormError(error.message);
      } else {
        setFormError('The pad map could not be saved. Check the connection and try again.');
      }
    }
  };

  // Ctrl+S / ⌘S saves without leaving the keyboard
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === 's') {
        event.preventDefault();
        void submit();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const onRequest = async (line: ReservedLine) => {
    if (!line.source) return;
    try {
      await request.mutateAsync({ partId: line.partId, fromShopId: line.source.shopId, toShopId: ws.job.shopId, quantity: Math.min(line.uncovered, line.source.free) });
    } catch {
      // shown below the parts list from the mutation's error
    }
  };

  const instrument = [ws.instrument.familyLabel, [ws.instrument.maker, ws.instrument.model].filter(Boolean).join(' '), `serial ${ws.instrument.serial}`].join(' · ');
  const hasKinds = { selfLeveling: form.rows.some((r) => r.padKind === 'self_leveling'), glued: form.rows.some((r) => r.padKind === 'glued') };
  const rules = ws.rules;

  return (
    <form onSubmit={(event) => void submit(event)} noValidate className="space-y-6" data-print="page">
      <PageHeader
        title={`Pad map · Job ${ws.job.number}`}
        description={
          <>
            {instrument} · at {ws.job.shopName}
            {jobHref ? (
              <>
                {' · '}
                <Link to={jobHref} className="font-semibold text-accent-700 underline" data-print="hide">Back to the job</Link>
              </>
            ) : null}
          </>
        }
        actions={
          <Button variant="secondary" onClick={() => window.print()} data-print="hide">
            Print
          </Button>
        }
      />

      <StartedFromNote ws={ws} from={form.from} onFill={form.fillFromSuggestions} readOnly={readOnly} />
      {readOnly ? (
        <p className="rounded-xl border border-paper-300 bg-paper-50 px-4 py-3 text-sm text-ink-800">
          {ws.job.stage === 'released'
            ? 'This job has been released, so its pad map is read only.'
            : ws.job.stage === 'ready'
              ? 'This job is ready: its estimate is frozen, so its pad map is read only.'
              : 'You can read this pad map; the technicians and managers of its shop record it.'}
        </p>
      ) : null}

      <div className="flex flex-col gap-4 rounded-2xl border border-paper-200 bg-white p-4 sm:flex-row sm:flex-wrap sm:items-end" data-print="hide">
        <fieldset className="flex flex-wrap items-center gap-3">
          <legend className="mb-1 text-sm font-semibold text-ink-950">Bare numbers are in</legend>
          {(['mm', 'in'] as const).map((u) => (
            <label key={u} className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-paper-300 px-3 text-sm">
              <input type="radio" name="unit" value={u} checked={form.unit === u} disabled={readOnly} onChange={() => form.setUnit(u)} />
              {u === 'mm' ? 'millimetres' : 'inches'}
            </label>
          ))}
        </fieldset>
        {!readOnly ? (
          <div className="flex flex-wrap items-end gap-2">
            <label className="flex flex-col gap-1 text-sm font-semibold text-ink-950">
              Pad kind for every key
              <select value={kindForAll} onChange={(e) => setKindForAll(e.target.value as PadKind)} className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 font-normal">
                {PAD_KINDS.map((k) => <option key={k} value={k}>{PAD_KIND_LABELS[k]}</option>)}
              </select>
            </label>
            <Button variant="secondary" onClick={() => form.setAllKinds(kindForAll)}>Apply to all keys</Button>
          </div>
        ) : null}
        <p className="text-xs text-ink-600 sm:ml-auto sm:max-w-sm">
          Rules: self-leveling clearance ≥ {formatMm(rules.selfLevelingMinClearanceMm)} per side; glued offset {rules.gluedOffsetMm >= 0 ? '+' : ''}{formatMm(rules.gluedOffsetMm)};
          rim overlap ≥ {formatMm(rules.minRimOverlapMm)}; stems {rules.stemHeightsMm.map((h) => formatMm(h, 1)).join(', ')}; face ≥ {formatMm(rules.minProtrusionMm)} above the rim.
          {rulesHref ? <> <Link to={rulesHref} className="font-semibold text-accent-700 underline">Change the rules</Link></> : null}
        </p>
      </div>

      {form.rows.length === 0 ? (
        <EmptyState
          title="No padded keys listed for this family"
          action={!readOnly ? <Button variant="secondary" onClick={form.addKey}>Add a key</Button> : undefined}
        >
          Add each padded key by name to map it.
        </EmptyState>
      ) : (
        <>
          <p className="text-sm text-ink-600" data-print="hide">
            Type a reading and press Enter to go down the column, Tab to go along the row, Shift+Enter to go back up; Ctrl+S saves.
            Units can be typed inline: <kbd className="rounded bg-paper-200 px-1">30.5</kbd>, <kbd className="rounded bg-paper-200 px-1">30.5mm</kbd>,{' '}
            <kbd className="rounded bg-paper-200 px-1">1.200in</kbd> or <kbd className="rounded bg-paper-200 px-1">1.2"</kbd> (1 in = 25.4 mm exactly).
          </p>
          <PadMapGrid
            rows={form.rows}
            unit={form.unit}
            preview={form.preview}
            serverErrors={serverErrors}
            suggestions={ws.suggestions?.keys ?? null}
            readOnly={readOnly}
            onChange={form.update}
            onRemove={form.removeKey}
          />
          {!readOnly ? (
            <Button variant="quiet" onClick={form.addKey} data-print="hide">+ Add a key</Button>
          ) : null}
        </>
      )}

      {!readOnly ? (
        <div className="flex flex-wrap items-center gap-3 rounded-2xl border border-paper-200 bg-white px-4 py-3 xl:sticky xl:bottom-0 xl:z-20 xl:bg-white/95" data-print="hide" data-save-bar>
          <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save pad map'}</Button>
          <p className="text-sm text-ink-800" role="status" aria-live="polite">
            {save.isPending
              ? 'Saving and reserving the pads…'
              : form.dirty
                ? `Unsaved changes · ${result.counts.padsChosen} pads`
                : ws.padMap
                  ? `Saved · ${result.counts.padsChosen} pads reserved at ${ws.job.shopName}`
                  : 'Not saved yet'}
            {result.counts.errors + readingErrors ? ` · ${result.counts.errors + readingErrors} to fix` : ''}
            {result.counts.warnings ? ` · ${result.counts.warnings} ${result.counts.warnings === 1 ? 'warning' : 'warnings'}` : ''}
          </p>
          {formError ? <p role="alert" className="w-full text-sm font-semibold text-danger-700">{formError}</p> : null}
        </div>
      ) : null}

      <div className="grid gap-6">
        <PartsSummary
          parts={result.parts}
          stems={result.stems}
          labor={result.labor}
          keyNames={keyNames}
          stock={ws.stock}
          reserved={ws.parts}
          shopName={ws.job.shopName}
          dirty={form.dirty}
          services={ws.services}
          serviceId={form.serviceId}
          onServiceChange={form.setServiceId}
          canRequest={ws.can.requestParts}
          requesting={request.isPending ? (request.variables?.partId ?? null) : null}
          onRequest={(line) => void onRequest(line)}
          requestError={request.isError ? (isApiError(request.error) ? request.error.message : 'The request could not be sent.') : null}
        />
        <InstallChecklist selfLeveling={hasKinds.selfLeveling} glued={hasKinds.glued} />
      </div>
    </form>
  );
}

function StartedFromNote({ ws, from, onFill, readOnly }: { ws: PadMapWorkspace; from: ReturnType<typeof usePadMapForm>['from']; onFill: () => void; readOnly: boolean }) {
  const date = (iso: string) => formatDate(iso, viewerTimeZone());
  if (from.kind === 'saved') {
    return <p className="text-sm text-ink-600">Saved by {from.map.createdBy} on {date(from.map.updatedAt)}.</p>;
  }
  if (from.kind === 'previous') {
    return (
      <p className="rounded-xl border border-accent-200 bg-accent-50 px-4 py-3 text-sm text-ink-950">
        Started from the pad map of {from.map.jobNumber ? `job ${from.map.jobNumber}` : 'an earlier visit'} at {from.map.shopName} ({date(from.map.updatedAt)}).
        Measure again any cup that may have changed.
      </p>
    );
  }
  const s = ws.suggestions;
  if (!s || s.basedOnMaps === 0) {
    return <p className="text-sm text-ink-600">This serial has no earlier pad map, and the network has none of this model yet.</p>;
  }
  return (
    <div className="flex flex-col gap-3 rounded-xl border border-accent-200 bg-accent-50 px-4 py-3 text-sm text-ink-950 sm:flex-row sm:items-center">
      <p className="flex-1">
        No earlier pad map of this serial. The network suggests pad sizes per key from the median of {s.basedOnMaps} {s.basedOnMaps === 1 ? 'map' : 'maps'} of{' '}
        {[s.maker, s.model].filter(Boolean).join(' ')} instruments; they are shown under each key name.
      </p>
      {!readOnly ? (
        <Button variant="secondary" onClick={onFill} data-print="hide">Fill empty cups from the suggestions</Button>
      ) : null}
    </div>
  );
}
