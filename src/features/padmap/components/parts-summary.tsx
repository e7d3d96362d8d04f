import type { LaborEstimate, PartsLine, StemLine } from '@shared/padmap/compute';
import { PAD_KIND_LABELS } from '@shared/padmap/rules';
import { formatInches, formatMm } from '@shared/padmap/units';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import type { PadStock, ReservedLine, ServiceOption } from '../types';
import { formatCents } from '@shared/money';

interface PartsSummaryProps {
  parts: PartsLine[];
  stems: StemLine[];
  labor: LaborEstimate | null;
  keyNames: Map<string, string>;
  stock: PadStock[];
  reserved: ReservedLine[];
  shopName: string;
  /** The grid differs from what was saved: reservations shown are those of the last save. */
  dirty: boolean;
  services: ServiceOption[];
  serviceId: string | null;
  onServiceChange: (id: string | null) => void;
  canRequest: boolean;
  requesting: string | null;
  onRequest: (line: ReservedLine) => void;
  requestError: string | null;
}

const money = formatCents;

/** The parts list the map makes, with what the shop's shelf holds and, once saved, the reservation. */
export function PartsSummary(props: PartsSummaryProps) {
  const { parts, stems, labor, keyNames, stock, reserved, shopName, dirty, services, serviceId, onServiceChange, canRequest, requesting, onRequest, requestError } = props;
  const stockOf = new Map(stock.map((s) => [s.partId, s]));
  const reservedOf = new Map(reserved.map((r) => [r.partId, r]));
  const totalPads = parts.reduce((sum, p) => sum + p.quantity, 0);
  const totalCents = parts.reduce((sum, p) => sum + (p.unitPriceCents ?? 0) * p.quantity, 0);

  return (
    <Card as="section" aria-labelledby="parts-heading" className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <CardTitle id="parts-heading">Parts list</CardTitle>
        <p className="text-sm text-ink-600">
          {totalPads} {totalPads === 1 ? 'pad' : 'pads'} · {money(totalCents)}
        </p>
      </div>
      {parts.length === 0 ? (
        <p className="text-ink-600">No pads yet: measure a cup to see its pad here.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Pads by kind, size and thickness</caption>
            <thead className="border-b border-paper-200 text-ink-600">
              <tr>
                <th scope="col" className="py-2 pr-3 font-semibold">Pad</th>
                <th scope="col" className="py-2 pr-3 text-right font-semibold">Qty</th>
                <th scope="col" className="py-2 pr-3 font-semibold">Keys</th>
                <th scope="col" className="py-2 font-semibold">At {shopName}</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-paper-200">
              {parts.map((line) => {
                const shelf = line.partId ? stockOf.get(line.partId) : undefined;
                const free = shelf ? shelf.onHand - (shelf.reserved - shelf.reservedForJob) : 0;
                const saved = !dirty && line.partId ? reservedOf.get(line.partId) : undefined;
                return (
                  <tr key={`${line.padKind}:${line.diameterMm}`} data-part={line.sku ?? ''}>
                    <th scope="row" className="py-2 pr-3 align-top font-normal">
                      <span className="font-semibold text-ink-950">
                        {PAD_KIND_LABELS[line.padKind]} {formatMm(line.diameterMm, 1)}
                      </span>{' '}
                      <span className="text-ink-600">({formatInches(line.diameterMm)})</span>
                      {line.thicknessMm != null ? <span className="text-ink-600"> × {formatMm(line.thicknessMm, 1)}</span> : null}
                      {line.sku ? <span className="block text-xs text-ink-600">{line.sku}</span> : null}
                    </th>
                    <td className="py-2 pr-3 text-right align-top font-semibold tabular-nums">{line.quantity}</td>
                    <td className="py-2 pr-3 align-top text-ink-800">{line.keyIds.map((id) => keyNames.get(id) ?? id).join(', ')}</td>
                    <td className="py-2 align-top">
                      {saved ? (
                        <ReservedCell line={saved} canRequest={canRequest} requesting={requesting === saved.partId} onRequest={() => onRequest(saved)} />
                      ) : (
                        <span className={free >= line.quantity ? 'text-ink-800' : 'font-semibold text-danger-700'}>
                          {free >= line.quantity ? `${Math.max(free, 0)} free on the shelf` : `Short ${line.quantity - Math.max(free, 0)} (${Math.max(free, 0)} free)`}
                          <span className="block text-xs font-normal text-ink-600">Saving reserves them.</span>
                        </span>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      {requestError ? <p role="alert" className="text-sm text-danger-700">{requestError}</p> : null}

      {stems.length ? (
        <div>
          <h3 className="text-sm font-semibold text-ink-950">Mounting stems</h3>
          <p className="text-sm text-ink-800">
            {stems.map((s) => `${s.quantity} × ${formatMm(s.heightMm, 1)}`).join(' · ')}
          </p>
        </div>
      ) : null}

      <div className="space-y-2 border-t border-paper-200 pt-4">
        <label className="flex flex-col gap-1 text-sm font-semibold text-ink-950 sm:flex-row sm:items-center sm:gap-3">
          Labor from the service catalog
          <select
            value={serviceId ?? ''}
            onChange={(e) => onServiceChange(e.target.value || null)}
            className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 font-normal"
          >
            <option value="">No labor estimate</option>
            {services.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name} ({s.standardHours} h)
              </option>
            ))}
          </select>
        </label>
        {labor && labor.selfLevelingPads + labor.gluedPads === 0 ? (
          <p className="text-sm text-ink-800" data-labor>
            <span className="text-base font-semibold text-ink-950">0 h</span> estimated: no pad chosen yet ({labor.standardHours} h in the catalog for a full repad).
          </p>
        ) : labor ? (
          <p className="text-sm text-ink-800" data-labor>
            <span className="text-base font-semibold text-ink-950">{labor.hours} h</span> estimated for {labor.keysRepadded}{' '}
            {labor.keysRepadded === 1 ? 'key' : 'keys'} repadded: {labor.baseHours} h base + {labor.perKeyHours} h per key
            {labor.selfLevelingPads ? ` (${labor.selfLevelingPads} self-leveling at ${Math.round(labor.factor * 100)} %)` : ''}; the catalog’s full
            repad is {labor.standardHours} h.
          </p>
        ) : null}
      </div>
    </Card>
  );
}

function ReservedCell({ line, canRequest, requesting, onRequest }: { line: ReservedLine; canRequest: boolean; requesting: boolean; onRequest: () => void }) {
  return (
    <div className="space-y-1" data-reserved={line.quantity}>
      <span className="font-semibold text-accent-800">Reserved {line.quantity}</span>
      <span className="text-ink-600"> · {line.onHand} on hand</span>
      {line.shortfall > 0 ? <p className="font-semibold text-danger-700">Short {line.shortfall}</p> : null}
      {line.requested.map((r) => (
        <p key={r.id} className="text-xs text-ink-800">
          {r.quantity} {r.state === 'sent' ? 'on the way' : 'requested'} from {r.fromShopName}
        </p>
      ))}
      {line.uncovered > 0 && line.source ? (
        <div className="text-xs text-ink-800">
          <p>
            {line.source.shopName} has {line.source.free}
            {line.source.distanceKm != null ? ` · ${line.source.distanceKm.toLocaleString('en-US')} km` : ''}
            {line.source.relayRun ? ' · relay run' : ''}
          </p>
          {canRequest ? (
            <Button variant="secondary" className="mt-1 text-xs" data-print="hide" disabled={requesting} onClick={onRequest}>
              {requesting ? 'Requesting…' : `Request ${Math.min(line.uncovered, line.source.free)} from ${line.source.shopName}`}
            </Button>
          ) : null}
        </div>
      ) : null}
      {line.uncovered > 0 && !line.source ? <p className="text-xs text-ink-600">No other shop has any: order from the supplier.</p> : null}
    </div>
  );
}
