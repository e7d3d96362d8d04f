import type { ReactNode } from 'react';
import { subject } from '@casl/ability';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '@shared/domain';
import { buttonClasses } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useAppAbility } from '@/lib/ability';
import { formatInShop } from '../format';
import { transferDetailQueryOptions } from '../queries';
import type { TransferDetail } from '../types';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { TransferActions } from './transfer-actions';
import { TransferStateBadge } from './transfer-state-badge';

interface TransferDetailViewProps {
  id: string;
  currentUserId: string;
  hrefFor: (path: string) => string;
}

export function TransferDetailView({ id, currentUserId, hrefFor }: TransferDetailViewProps) {
  const detail = useQuery(transferDetailQueryOptions(id));
  const ability = useAppAbility();
  if (detail.isPending) return <PageSpinner label="Loading the transfer…" />;
  if (detail.isError) {
    return (
      <ErrorState
        title={isApiError(detail.error) && detail.error.status === 404 ? 'Transfer not found' : 'The transfer could not be loaded'}
        error={detail.error}
        onRetry={() => void detail.refetch()}
      />
    );
  }
  const t = detail.data;
  // the packing form carries the caution itself; everyone else handling the case sees it here
  const packingHere = t.state === 'approved' && !t.pendingStep && ability.can('pack', subject('Transfer', { fromShopId: t.fromShop.id }));
  const showCaution = t.heavyCase && ['approved', 'packed', 'in_transit'].includes(t.state) && !packingHere;

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <p className="text-sm font-medium text-ink-600">
          <Link to={hrefFor('/transfers')} className="underline-offset-2 hover:underline">
            Transfers
          </Link>{' '}
          / Job {t.job.number}
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">
            {INSTRUMENT_FAMILY_LABELS[t.instrument.family]}: {t.fromShop.name} → {t.toShop.name}
          </h1>
          <TransferStateBadge state={t.state} overdue={t.overdue} />
        </div>
        <p className="text-ink-600">
          {[t.instrument.maker, t.instrument.model].filter(Boolean).join(' ')} · serial <span className="font-mono text-ink-800">{t.instrument.serial}</span>
          {t.instrument.assetTag ? ` · tag ${t.instrument.assetTag}` : ''} ·{' '}
          <Link to={hrefFor(`/registry/instruments/${t.instrument.id}`)} className="font-semibold text-accent-700 underline-offset-2 hover:underline">
            Instrument history
          </Link>
        </p>
      </header>

      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="flex flex-col gap-6">
          <Facts t={t} hrefFor={hrefFor} />
          <Timeline t={t} />
        </div>
        <div className="flex flex-col gap-4">
          <TransferActions transfer={t} currentUserId={currentUserId} />
          {showCaution ? <HazardCautions hazards={['heavy_lift']} /> : null}
          <Card as="section" aria-label="Manifest">
            <CardTitle>Manifest</CardTitle>
            {t.manifestAvailable ? (
              <>
                <p className="mt-1 text-sm text-ink-600">
                  One page with the serial, the route, the run date, what travels and a QR code that opens this transfer. Print it, sign
                  it at the hand-over and pack it with the instrument.
                </p>
                <a className={buttonClasses('secondary', 'md', 'mt-3')} href={`/api/transfers/${t.id}/manifest`} download>
                  Download manifest (PDF)
                </a>
              </>
            ) : (
              <p className="mt-1 text-sm text-ink-600">
                {t.state === 'cancelled' || t.state === 'rejected'
                  ? `This transfer was ${t.state}; it has no manifest.`
                  : t.state === 'packed' || t.state === 'in_transit' || t.state === 'received'
                    ? 'The manifest is being made; it appears here in a moment.'
                    : 'The manifest is made when the instrument is packed.'}
              </p>
            )}
          </Card>
        </div>
      </div>
    </div>
  );
}

function Facts({ t, hrefFor }: { t: TransferDetail; hrefFor: (path: string) => string }) {
  const rows: Array<[string, ReactNode]> = [
    ['Job', <Link key="job" className="font-semibold text-accent-700 underline-offset-2 hover:underline" to={hrefFor(`/jobs/${t.job.id}`)}>Job {t.job.number} · {JOB_STAGE_LABELS[t.job.stage]}</Link>],
    ['Complaint', t.job.complaint],
    ['Reason', t.reason],
    ['Requested', `${formatInShop(t.requestedAt, t.fromShop.timeZone)}${t.requestedBy ? ` by ${t.requestedBy.name}` : ''}`],
  ];
  if (t.approvedBy) rows.push([t.state === 'rejected' ? 'Rejected by' : 'Approved', `${t.approvedAt ? `${formatInShop(t.approvedAt, t.fromShop.timeZone)} by ` : ''}${t.approvedBy.name}`]);
  if (t.decisionNote) rows.push([t.state === 'cancelled' ? 'Why cancelled' : 'Note', t.decisionNote]);
  if (t.packedBy) rows.push(['Packed', `${formatInShop(t.packedAt, t.fromShop.timeZone)} by ${t.packedBy.name}`]);
  if (t.caseCount) rows.push(['Cases', String(t.caseCount)]);
  if (t.contents) rows.push(['Contents', t.contents]);
  if (t.departureCondition) rows.push(['Condition on departure', t.departureCondition]);
  rows.push(['Relay run', t.relayRun ? t.relayRun.label : t.state === 'in_transit' || t.state === 'received' ? 'Ad-hoc courier' : 'Chosen when packed']);
  if (t.handedOverAt && t.relayRun) rows.push(['Handed over', formatInShop(t.handedOverAt, t.fromShop.timeZone)]);
  if (t.departedAt && t.relayRun) {
    // a hand-over waits for the run: the date people plan by is the run's, not the hand-over's
    rows.push([t.waitingForRun ? 'Waiting for the run of' : 'Left on the run of', <strong key="run">{formatInShop(t.departedAt, t.fromShop.timeZone)}</strong>]);
  } else if (t.departedAt) {
    rows.push(['Left', formatInShop(t.departedAt, t.fromShop.timeZone)]);
  }
  if (t.expectedArrivalAt) rows.push(['Expected', formatInShop(t.expectedArrivalAt, t.toShop.timeZone)]);
  if (t.receivedAt) rows.push(['Received', `${formatInShop(t.receivedAt, t.toShop.timeZone)}${t.receivedBy ? ` by ${t.receivedBy.name}` : ''}`]);
  return (
    <Card as="section" aria-label="Details">
      <CardTitle>Details</CardTitle>
      <dl className="mt-3 grid grid-cols-1 gap-x-6 gap-y-2 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
        {rows.map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="font-medium text-ink-600">{label}</dt>
            <dd className="text-ink-950">{value}</dd>
          </div>
        ))}
      </dl>
    </Card>
  );
}

/** This transfer's entries on the instrument's timeline, as every shop sees them. */
function Timeline({ t }: { t: TransferDetail }) {
  const zoneOf = (shopId: string | null) => (shopId === t.toShop.id ? t.toShop.timeZone : t.fromShop.timeZone);
  return (
    <Card as="section" aria-label="Timeline">
      <CardTitle>On the instrument’s timeline</CardTitle>
      {t.history.length ? (
        <ol className="mt-3 flex flex-col gap-3 border-l-2 border-paper-200 pl-4">
          {t.history.map((h) => (
            <li key={h.id} className="relative">
              <span className="absolute top-1.5 -left-[1.3rem] size-2.5 rounded-full bg-accent-600" aria-hidden="true" />
              <p className="text-sm font-medium text-ink-950">{h.summary}</p>
              <p className="text-xs text-ink-600">
                {formatInShop(h.occurredAt, zoneOf(h.shopId))}
                {h.user ? ` · ${h.user.name}` : ''}
              </p>
            </li>
          ))}
        </ol>
      ) : (
        <p className="mt-1 text-sm text-ink-600">Nothing recorded for this transfer yet.</p>
      )}
    </Card>
  );
}
