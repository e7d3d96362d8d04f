import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { familyLabel, stageLabel } from '@/features/registry/format';
import { InstrumentFacts, JobList, OtherMakersWarning, OwnerCard } from '@/features/registry/components/instrument-overview';
import { InstrumentTimeline } from '@/features/registry/components/instrument-timeline';
import { instrumentQueryOptions } from '@/features/registry/queries';
import { formatTimeZone } from '@/features/shops/format';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { formatDateTime } from '@shared/time/format';
import { NotFoundRoute } from './not-found';

export function InstrumentRoute() {
  const { id = '' } = useParams();
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  const detail = useQuery(instrumentQueryOptions(id));
  const i = detail.data?.instrument;
  useDocumentTitle(i ? `${i.maker} ${i.serial}` : 'Instrument');
  const instrumentPath = (other: string) => withShop(`/registry/instruments/${other}`, currentShop?.id);
  const jobPath = (jobId: string) => withShop(`/jobs/${jobId}`, currentShop?.id);

  if (detail.isPending) return <PageSpinner label="Loading the instrument…" />;
  if (detail.isError) {
    if ((detail.error as { status?: number }).status === 404) return <NotFoundRoute />;
    return <ErrorState title="The instrument could not be loaded" error={detail.error} onRetry={() => void detail.refetch()} />;
  }
  const data = detail.data;
  const inst = data.instrument;
  const canTakeIn = ability.can('create', 'Job') && !data.openJob && inst.status !== 'retired';

  return (
    <>
      <PageHeader
        title={`${inst.maker} ${inst.model ?? ''} · SN ${inst.serial}`}
        description={
          <>
            {data.onRoad ? (
              <>
                {familyLabel(inst.family)}, {data.onRoad.onRelayRun ? 'on the relay run' : 'with a courier'} from {data.onRoad.fromShop?.name ?? '—'} to{' '}
                {data.onRoad.toShop?.name ?? '—'}
                {data.onRoad.expectedArrivalAt && data.onRoad.toShop
                  ? `, expected ${formatDateTime(data.onRoad.expectedArrivalAt, data.onRoad.toShop.timeZone)}`
                  : ''}
                .
              </>
            ) : (
              <>
                {familyLabel(inst.family)}, now at {inst.currentShop?.name ?? '—'}.
              </>
            )}
            {data.openJob ? ` Job ${data.openJob.number} is ${stageLabel(data.openJob.stage).toLowerCase()} at ${data.openJob.shop?.name}.` : ' No open job.'}
          </>
        }
        actions={
          <>
            {canTakeIn ? <ButtonLink to={withShop(`/intake?instrument=${inst.id}`, currentShop?.id)}>Take it in</ButtonLink> : null}
            {ability.can('read', 'Attachment') ? (
              <ButtonLink variant="secondary" to={withShop(`/instruments/${inst.id}/photos`, currentShop?.id)}>
                Photos
              </ButtonLink>
            ) : null}
            <ButtonLink variant="secondary" to={withShop(`/registry/instruments/${inst.id}/label`, currentShop?.id)}>
              QR label
            </ButtonLink>
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <OtherMakersWarning detail={data} instrumentPath={instrumentPath} />
        <div className="grid grid-cols-1 gap-6 lg:grid-cols-3">
          <Card as="section" aria-labelledby="facts-heading" className="lg:col-span-2">
            <CardTitle id="facts-heading" className="mb-4">The instrument</CardTitle>
            <InstrumentFacts detail={data} />
          </Card>
          <OwnerCard owner={data.owner} />
        </div>
        <Card as="section" aria-labelledby="visits-heading">
          <CardTitle id="visits-heading">Visits</CardTitle>
          <JobList detail={data} timeZone={currentShop?.timeZone} jobPath={ability.can('read', 'Job') ? jobPath : undefined} />
        </Card>
        <InstrumentTimeline
          instrumentId={inst.id}
          timeZone={currentShop?.timeZone}
          timeZoneLabel={currentShop ? `${currentShop.name}’s time (${formatTimeZone(currentShop.timeZone)})` : undefined}
          jobPath={ability.can('read', 'Job') ? jobPath : undefined}
        />
      </div>
    </>
  );
}
