import { useQuery } from '@tanstack/react-query';
import { Fragment, useState, type FormEvent } from 'react';
import { HAZARD_LABELS, type Hazard } from '@shared/safety/hazards';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { HazardCheckboxes } from '@/components/ui/hazard-checkboxes';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { stockQueryOptions, useAdjustStock, useRequestTransfer, useSetPartHazards, useTransferStep } from '../queries';
import type { PartTransferView, StockFilters, StockPage, StockRow } from '../types';

const kindLabel = (row: StockRow) =>
  row.kind === 'pad' ? (row.padKind === 'self_leveling' ? 'Self-leveling pad' : 'Glued pad') : 'Part';
const mm = (v: number | null) => (v == null ? '—' : `${v.toFixed(1)} mm`);

/** One shop's shelf: every part with what is on hand, reserved by jobs, short, and coming in. */
export function StockScreen({ shopId }: { shopId: string }) {
  const [filters, setFilters] = useState<StockFilters>({ attention: true });
  const [search, setSearch] = useState('');
  const stock = useQuery(stockQueryOptions(shopId, filters));

  const applySearch = (event: FormEvent) => {
    event.preventDefault();
    setFilters((f) => ({ ...f, q: search }));
  };

  return (
    <div className="space-y-6">
      <form onSubmit={applySearch} className="flex flex-col gap-3 rounded-2xl border border-paper-200 bg-white p-4 sm:flex-row sm:flex-wrap sm:items-end">
        <label className="flex flex-col gap-1 text-sm font-semibold text-ink-950">
          Show
          <select
            value={filters.kind ?? ''}
            onChange={(e) => setFilters((f) => ({ ...f, kind: (e.target.value || undefined) as StockFilters['kind'] }))}
            className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 font-normal"
          >
            <option value="">All parts</option>
            <option value="pad">Pads</option>
            <option value="other">Other parts</option>
          </select>
        </label>
        <label className="inline-flex min-h-11 items-center gap-2 text-sm font-semibold text-ink-950">
          <input type="checkbox" checked={!!filters.attention} onChange={(e) => setFilters((f) => ({ ...f, attention: e.target.checked }))} className="size-4" />
          Only shortages and low stock
        </label>
        <label className="flex flex-1 flex-col gap-1 text-sm font-semibold text-ink-950">
          Find a part
          <input
            type="search"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            placeholder="SKU or name, e.g. PAD-S-30"
            className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 font-normal"
          />
        </label>
        <Button type="submit" variant="secondary">Search</Button>
      </form>

      {stock.isPending ? (
        <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
          <Spinner label="Loading stock…" showLabel />
        </div>
      ) : stock.isError ? (
        <ErrorState title="The stock could not be loaded" error={stock.error} onRetry={() => void stock.refetch()} retrying={stock.isFetching} />
      ) : (
        <>
          <p className="text-sm text-ink-800" role="status">
            {stock.data.totals.short} {stock.data.totals.short === 1 ? 'part' : 'parts'} short · {stock.data.totals.belowReorderPoint} at or below the reorder point
          </p>
          {stock.data.rows.length === 0 ? (
            <EmptyState title={filters.attention ? 'Nothing short or low' : 'No parts found'}>
              {filters.attention ? 'Every reserved part is on the shelf. Untick “Only shortages and low stock” to see everything.' : 'Try another search.'}
            </EmptyState>
          ) : (
            <StockTable page={stock.data} />
          )}
          <Transfers page={stock.data} />
        </>
      )}
    </div>
  );
}

function StockTable({ page }: { page: StockPage }) {
  const adjust = useAdjustStock(page.shop.id);
  const request = useRequestTransfer();
  const [editing, setEditing] = useState<{ partId: string; onHand: string; reorderPoint: string } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const setHazards = useSetPartHazards();
  const [tagging, setTagging] = useState<{ partId: string; name: string; hazards: Hazard[] } | null>(null);
  const saveHazards = async (event: FormEvent) => {
    event.preventDefault();
    if (!tagging) return;
    await setHazards.mutateAsync({ partId: tagging.partId, hazards: tagging.hazards }).then(() => setTagging(null), () => undefined);
  };

  const saveCount = async (event: FormEvent) => {
    event.preventDefault();
    if (!editing) return;
    setError(null);
    try {
      await adjust.mutateAsync({ partId: editing.partId, onHand: Number(editing.onHand), reorderPoint: Number(editing.reorderPoint) });
      setEditing(null);
    } catch (e) {
      setError(isApiError(e) ? Object.values(e.fieldErrors)[0] ?? e.message : 'The count could not be saved.');
    }
  };

  return (
    <div className="overflow-x-auto rounded-2xl border border-paper-200 bg-white">
      <table className="w-full min-w-[56rem] text-left text-sm">
        <caption className="sr-only">Stock at {page.shop.name}</caption>
        <thead className="border-b border-paper-200 bg-paper-50 text-ink-600">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">Part</th>
            <th scope="col" className="px-3 py-2 font-semibold">Size</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">On hand</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Reserved</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Available</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Reorder at</th>
            <th scope="col" className="px-3 py-2 font-semibold">Status</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-200">
          {page.rows.map((row) => {
            const isEditing = editing?.partId === row.partId;
            const need = row.shortage - row.incoming;
            return (
              <Fragment key={row.partId}>
              <tr className={cn('align-top', row.shortage > 0 && 'bg-danger-50/60')}>
                <th scope="row" className="px-3 py-2 font-normal">
                  <span className="font-semibold text-ink-950">{row.name}</span>
                  <span className="block text-xs text-ink-600">{row.sku} · {kindLabel(row)}</span>
                  {row.hazards.length ? (
                    <span className="mt-1 block text-xs text-[#8a5300]">Hazards: {row.hazards.map((h) => HAZARD_LABELS[h]).join('; ')}</span>
                  ) : null}
                  {page.can.setHazards && tagging?.partId !== row.partId ? (
                    <Button variant="quiet" className="mt-1 text-xs" onClick={() => setTagging({ partId: row.partId, name: row.name, hazards: row.hazards })}>
                      Hazards<span className="sr-only"> of {row.name}</span>
                    </Button>
                  ) : null}
                </th>
                <td className="px-3 py-2 tabular-nums">{row.kind === 'pad' ? `${mm(row.diameterMm)} × ${mm(row.thicknessMm)}` : '—'}</td>
                {isEditing ? (
                  <td colSpan={4} className="px-3 py-2">
                    <form onSubmit={(event) => void saveCount(event)} className="flex flex-wrap items-end gap-2">
                      <label className="flex flex-col text-xs font-semibold">
                        On hand
                        {/* eslint-disable-next-line jsx-a11y/no-autofocus -- the field the person just asked to edit, opened by their own click */}
                        <input autoFocus type="number" min={0} value={editing.onHand} onChange={(e) => setEditing({ ...editing, onHand: e.target.value })} className="min-h-10 w-20 rounded-md border border-paper-300 px-2" />
                      </label>
                      <label className="flex flex-col text-xs font-semibold">
                        Reorder at
                        <input type="number" min={0} value={editing.reorderPoint} onChange={(e) => setEditing({ ...editing, reorderPoint: e.target.value })} className="min-h-10 w-20 rounded-md border border-paper-300 px-2" />
                      </label>
                      <Button type="submit" disabled={adjust.isPending}>Save</Button>
                      <Button variant="quiet" onClick={() => setEditing(null)}>Cancel</Button>
                      {error ? <p role="alert" className="w-full text-xs text-danger-700">{error}</p> : null}
                    </form>
                  </td>
                ) : (
                  <>
                    <td className="px-3 py-2 text-right tabular-nums">{row.onHand}</td>
                    <td className="px-3 py-2 text-right tabular-nums">{row.reserved}</td>
                    <td className={cn('px-3 py-2 text-right font-semibold tabular-nums', row.available < 0 && 'text-danger-700')}>{row.available}</td>
                    <td className="px-3 py-2 text-right tabular-nums">{row.reorderPoint}</td>
                  </>
                )}
                <td className="px-3 py-2">
                  {row.shortage > 0 ? <p className="font-semibold text-danger-700">Short {row.shortage}</p> : row.belowReorderPoint ? <p className="font-semibold text-[#8a5300]">Reorder</p> : <p className="text-ink-600">OK</p>}
                  {row.incoming > 0 ? <p className="text-xs text-ink-800">{row.incoming} coming from other shops</p> : null}
                  {need > 0 && row.source ? (
                    <div className="text-xs text-ink-800">
                      <p>{row.source.shopName} has {row.source.free}{row.source.distanceKm != null ? ` · ${row.source.distanceKm.toLocaleString('en-US')} km` : ''}{row.source.relayRun ? ' · relay run' : ''}</p>
                      {page.can.request ? (
                        <Button
                          variant="secondary"
                          className="mt-1 text-xs"
                          disabled={request.isPending}
                          onClick={() => request.mutate({ partId: row.partId, fromShopId: row.source!.shopId, toShopId: page.shop.id, quantity: Math.min(need, row.source!.free) })}
                        >
                          Request {Math.min(need, row.source.free)} from {row.source.shopName}
                        </Button>
                      ) : null}
                    </div>
                  ) : null}
                  {page.can.update && !isEditing ? (
                    <Button variant="quiet" className="mt-1 text-xs" onClick={() => setEditing({ partId: row.partId, onHand: String(row.onHand), reorderPoint: String(row.reorderPoint) })}>
                      Count
                    </Button>
                  ) : null}
                </td>
              </tr>
              {tagging?.partId === row.partId ? (
                <tr>
                  <td colSpan={7} className="px-3 pb-3">
                    <form onSubmit={(e) => void saveHazards(e)} className="flex flex-col gap-2">
                      <HazardCheckboxes
                        of={row.name}
                        value={tagging.hazards}
                        onChange={(hazards) => setTagging({ ...tagging, hazards })}
                        error={isApiError(setHazards.error) ? setHazards.error.fieldErrors.hazards : undefined}
                      />
                      <div className="flex gap-2">
                        <Button type="submit" disabled={setHazards.isPending}>{setHazards.isPending ? 'Saving…' : 'Save hazards'}</Button>
                        <Button variant="quiet" onClick={() => setTagging(null)}>Cancel</Button>
                      </div>
                      {setHazards.isError && !isApiError(setHazards.error) ? <p role="alert" className="text-xs text-danger-700">The hazards could not be saved.</p> : null}
                      {isApiError(setHazards.error) && !setHazards.error.fieldErrors.hazards ? <p role="alert" className="text-xs text-danger-700">{setHazards.error.message}</p> : null}
                    </form>
                  </td>
                </tr>
              ) : null}
              </Fragment>
            );
          })}
        </tbody>
      </table>
      {request.isError ? <p role="alert" className="p-3 text-sm text-danger-700">{isApiError(request.error) ? request.error.message : 'The request could not be sent.'}</p> : null}
    </div>
  );
}

function Transfers({ page }: { page: StockPage }) {
  const step = useTransferStep();
  const list = (title: string, rows: PartTransferView[], direction: 'in' | 'out') => (
    <Card as="section" className="space-y-3">
      <CardTitle>{title}</CardTitle>
      {rows.length === 0 ? (
        <p className="text-sm text-ink-600">None in the last 30 days.</p>
      ) : (
        <ul className="divide-y divide-paper-200">
          {rows.map((t) => (
            <li key={t.id} className="flex flex-wrap items-center gap-3 py-2 text-sm">
              <div className="flex-1">
                <p className="font-semibold text-ink-950">{t.quantity} × {t.part.name}</p>
                <p className="text-xs text-ink-600">
                  {direction === 'in' ? `from ${t.fromShop.name}` : `to ${t.toShop.name}`}
                  {t.jobNumber ? ` · job ${t.jobNumber}` : ''}
                  {t.relayRun ? ' · on the relay run' : ''} · {stateLabel[t.state]}
                </p>
              </div>
              {direction === 'in' && t.state === 'sent' && page.can.receive ? (
                <Button variant="secondary" disabled={step.isPending} onClick={() => step.mutate({ id: t.id, step: 'receive' })}>Receive</Button>
              ) : null}
              {direction === 'out' && t.state === 'requested' && page.can.pack ? (
                <Button variant="secondary" disabled={step.isPending} onClick={() => step.mutate({ id: t.id, step: 'send' })}>Send</Button>
              ) : null}
              {t.state === 'requested' && (direction === 'in' ? page.can.request : page.can.pack) ? (
                <Button variant="quiet" disabled={step.isPending} onClick={() => step.mutate({ id: t.id, step: 'cancel' })}>Cancel</Button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      {list('Parts coming in', page.transfers.incoming, 'in')}
      {list('Parts going out', page.transfers.outgoing, 'out')}
      {step.isError ? <p role="alert" className="text-sm text-danger-700 lg:col-span-2">{isApiError(step.error) ? step.error.message : 'That step failed.'}</p> : null}
    </div>
  );
}

const stateLabel: Record<PartTransferView['state'], string> = {
  requested: 'requested',
  sent: 'sent, on the way',
  received: 'received',
  cancelled: 'cancelled',
};
