import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { isApiError } from '@/lib/api-client';
import { registryKeys, registryMutations } from '../queries';
import { Card, CardTitle } from '@/components/ui/card';
import { OWNER_KIND_LABELS, CUSTOMER_KIND_LABELS } from '@shared/schemas/registry';
import { familyLabel, formatDay, formatInZone, stageLabel, statusLabel } from '../format';
import type { CustomerView, InstrumentDetail } from '../types';

interface InstrumentOverviewProps {
  detail: InstrumentDetail;
  /** The viewer's shop clock, for every time on the page. */
  timeZone: string | undefined;
  instrumentPath: (id: string) => string;
}

export function InstrumentFacts({ detail }: { detail: InstrumentDetail }) {
  const i = detail.instrument;
  const facts: Array<[string, string]> = [
    ['Family', familyLabel(i.family)],
    ['Maker', i.maker],
    ['Model', i.model ?? '—'],
    ['Serial as engraved', i.serial],
    ['Serial for search', i.serialNormalized],
    ['Asset tag', i.assetTag ?? '—'],
    ['Year made', i.yearMade ? String(i.yearMade) : '—'],
    ['Status', statusLabel(i.status)],
    ['Where it is', i.currentShop?.name ?? '—'],
    ['Owned by', OWNER_KIND_LABELS[i.ownerKind]],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-2">
      {facts.map(([term, value]) => (
        <div key={term} className="flex flex-col">
          <dt className="text-sm text-ink-600">{term}</dt>
          <dd className="font-semibold break-words text-ink-950">{value}</dd>
        </div>
      ))}
      {i.notes ? (
        <div className="flex flex-col sm:col-span-2">
          <dt className="text-sm text-ink-600">Notes</dt>
          <dd className="text-ink-950">{i.notes}</dd>
        </div>
      ) : null}
      <div className="flex flex-col gap-2 sm:col-span-2">
        <dt className="text-sm text-ink-600">Case</dt>
        <dd className="flex flex-col gap-2 text-ink-950">
          <HeavyCaseFlag detail={detail} />
          {i.heavyCase ? <HazardCautions hazards={['heavy_lift']} /> : null}
        </dd>
      </div>
    </dl>
  );
}

/** The desk marks an instrument that travels in a heavy case whatever its family. */
function HeavyCaseFlag({ detail }: { detail: InstrumentDetail }) {
  const i = detail.instrument;
  const client = useQueryClient();
  const save = useMutation({
    mutationFn: (heavyCase: boolean) => registryMutations.setHeavyCase(i.id, heavyCase),
    onSettled: () => client.invalidateQueries({ queryKey: registryKeys.instrument(i.id) }),
  });
  return (
    <>
      <label className="flex min-h-11 items-center gap-2 font-semibold">
        <input
          type="checkbox"
          className="size-5 accent-accent-600"
          checked={i.heavyCaseFlag}
          disabled={!i.canUpdate || save.isPending}
          onChange={(e) => save.mutate(e.target.checked)}
        />
        Travels in a heavy case
      </label>
      {save.isError ? <p role="alert" className="text-sm text-danger-700">{isApiError(save.error) ? save.error.message : 'Not saved. Try again.'}</p> : null}
    </>
  );
}

export function OwnerCard({ owner }: { owner: CustomerView | null }) {
  return (
    <Card as="section" aria-labelledby="owner-heading">
      <CardTitle id="owner-heading">Owner</CardTitle>
      {!owner ? (
        <p className="mt-2 text-ink-600">The network’s own rental fleet.</p>
      ) : (
        <div className="mt-2 flex flex-col gap-1">
          <p className="font-semibold text-ink-950">{owner.name ?? 'Private customer'}</p>
          <p className="text-sm text-ink-600">{CUSTOMER_KIND_LABELS[owner.kind]}</p>
          {owner.contactVisible && owner.contact ? (
            <dl className="mt-2 grid gap-1 text-sm">
              {owner.contact.contactName ? <ContactLine term="Contact" value={owner.contact.contactName} /> : null}
              {owner.contact.phone ? <ContactLine term="Phone" value={owner.contact.phone} href={`tel:${owner.contact.phone.replace(/\s+/g, '')}`} /> : null}
              {owner.contact.email ? <ContactLine term="E-mail" value={owner.contact.email} href={`mailto:${owner.contact.email}`} /> : null}
              {owner.contact.address ? <ContactLine term="Address" value={owner.contact.address} /> : null}
            </dl>
          ) : (
            <p className="mt-2 rounded-lg bg-paper-100 px-3 py-2 text-sm text-ink-800">
              Contact details stay with the shops that served this customer. Their work history is below.
            </p>
          )}
        </div>
      )}
    </Card>
  );
}

function ContactLine({ term, value, href }: { term: string; value: string; href?: string }) {
  return (
    <div className="flex gap-2">
      <dt className="w-20 shrink-0 text-ink-600">{term}</dt>
      <dd className="break-all text-ink-950">{href ? <a className="font-semibold text-accent-700 underline" href={href}>{value}</a> : value}</dd>
    </div>
  );
}

export function OtherMakersWarning({ detail, instrumentPath }: Pick<InstrumentOverviewProps, 'detail' | 'instrumentPath'>) {
  if (!detail.otherMakers.length) return null;
  return (
    <div role="note" className="rounded-xl border border-danger-200 bg-danger-50 px-4 py-3 text-sm text-ink-950">
      <p className="font-semibold">The same serial is registered under another maker</p>
      <ul className="mt-1 list-disc pl-5">
        {detail.otherMakers.map((o) => (
          <li key={o.id}>
            <Link className="font-semibold text-accent-700 underline" to={instrumentPath(o.id)}>
              {o.maker} {o.model ?? ''} ({familyLabel(o.family).toLowerCase()})
            </Link>{' '}
            at {o.currentShop.name}
          </li>
        ))}
      </ul>
      <p className="mt-1 text-ink-800">Check the maker on the instrument before taking it in.</p>
    </div>
  );
}

export function JobList({ detail, timeZone, jobPath }: Pick<InstrumentOverviewProps, 'detail' | 'timeZone'> & { jobPath?: (id: string) => string }) {
  if (!detail.jobs.length) return <p className="text-ink-600">No visits yet.</p>;
  return (
    <ul className="divide-y divide-paper-200">
      {detail.jobs.map((job) => (
        <li key={job.id} className="flex flex-col gap-1 py-3 sm:flex-row sm:justify-between sm:gap-4">
          <div>
            <p className="font-semibold text-ink-950">
              {jobPath ? (
                <Link className="text-accent-700 underline" to={jobPath(job.id)}>
                  Job {job.number}
                </Link>
              ) : (
                `Job ${job.number}`
              )}{' '}
              · {job.shop?.name ?? 'a shop'}
            </p>
            <p className="text-sm text-ink-800">{job.complaint}</p>
          </div>
          <div className="text-sm sm:text-right">
            <p className={job.open ? 'font-semibold text-accent-800' : 'text-ink-800'}>{stageLabel(job.stage)}</p>
            <p className="text-ink-600">Opened {formatInZone(job.openedAt, timeZone)}</p>
            {job.promisedOn && job.open ? <p className="text-ink-600">Promised {formatDay(job.promisedOn)}</p> : null}
          </div>
        </li>
      ))}
    </ul>
  );
}
