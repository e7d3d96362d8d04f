import { useNavigate, useSearchParams } from 'react-router-dom';
import { ButtonLink, ButtonAnchor } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { InstrumentSearch } from '@/features/registry/components/instrument-search';
import { SelectField } from '@/features/registry/components/fields';
import { exportUrl } from '@/features/registry/queries';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { INSTRUMENT_FAMILIES, INSTRUMENT_FAMILY_LABELS, type InstrumentFamily } from '@shared/domain';
import { INSTRUMENT_STATUSES, INSTRUMENT_STATUS_LABELS, type InstrumentStatus } from '@shared/schemas/registry';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** The shared registry: one serial box for the whole network, with filters and a CSV export of what it finds. */
export function RegistryRoute() {
  const me = useSession();
  const ability = useAppAbility();
  const navigate = useNavigate();
  const { currentShop } = useCurrentShop();
  const [params, setParams] = useSearchParams();
  useDocumentTitle('Registry');

  // the search lives in the address, so a result list can be shared, bookmarked and survives going back
  const q = params.get('q') ?? '';
  const family = (params.get('family') || undefined) as InstrumentFamily | undefined;
  const status = (params.get('status') || undefined) as InstrumentStatus | undefined;
  const shopId = params.get('at') || undefined;
  const set = (key: string, value: string) =>
    setParams(
      (previous) => {
        const next = new URLSearchParams(previous);
        if (value) next.set(key, value);
        else next.delete(key);
        return next;
      },
      { replace: true },
    );
  const instrumentPath = (id: string) => withShop(`/registry/instruments/${id}`, currentShop?.id);
  const filters = { family, status, shopId };

  return (
    <>
      <PageHeader
        title="Registry"
        description={`Every instrument ${me.network.name} has seen, at every shop. Type a serial to see where it is and what was done to it.`}
        actions={
          <>
            {ability.can('create', 'Job') ? <ButtonLink to={withShop('/intake', currentShop?.id)}>Take an instrument in</ButtonLink> : null}
            {ability.can('create', 'Instrument') ? (
              <ButtonLink variant="secondary" to={withShop('/registry/import', currentShop?.id)}>
                Import a fleet
              </ButtonLink>
            ) : null}
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
          <SelectField label="Family" value={family ?? ''} onChange={(e) => set('family', e.target.value)}>
            <option value="">Any family</option>
            {INSTRUMENT_FAMILIES.map((f) => <option key={f} value={f}>{INSTRUMENT_FAMILY_LABELS[f]}</option>)}
          </SelectField>
          <SelectField label="Now at" value={shopId ?? ''} onChange={(e) => set('at', e.target.value)}>
            <option value="">Any shop</option>
            {me.shops.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </SelectField>
          <SelectField label="Status" value={status ?? ''} onChange={(e) => set('status', e.target.value)}>
            <option value="">Any status</option>
            {INSTRUMENT_STATUSES.map((s) => <option key={s} value={s}>{INSTRUMENT_STATUS_LABELS[s]}</option>)}
          </SelectField>
        </div>
        <InstrumentSearch
          autoFocus
          query={q}
          onQueryChange={(value) => set('q', value)}
          filters={filters}
          listWithoutText
          onPick={(hit) => void navigate(instrumentPath(hit.id))}
          onScannedInstrument={(id) => void navigate(instrumentPath(id))}
          linkTo={(hit) => instrumentPath(hit.id)}
          footer={({ query, results }) =>
            results.length ? (
              <div>
                <ButtonAnchor variant="secondary" href={exportUrl({ q: query, ...filters })} download>
                  Download these as CSV
                </ButtonAnchor>
              </div>
            ) : null
          }
        />
      </div>
    </>
  );
}
