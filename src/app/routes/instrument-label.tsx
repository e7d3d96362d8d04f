import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { Button, ButtonLink } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { QrLabel } from '@/features/registry/components/qr-label';
import { instrumentQueryOptions } from '@/features/registry/queries';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

// When printing, only the label is on paper: no header, navigation or buttons.
const PRINT_CSS = `@media print {
  body * { visibility: hidden !important; }
  .qr-label, .qr-label * { visibility: visible !important; }
  .qr-label { position: absolute; left: 0; top: 0; border-color: #000; }
  @page { margin: 4mm; }
}`;

export function InstrumentLabelRoute() {
  const { id = '' } = useParams();
  const me = useSession();
  const { currentShop } = useCurrentShop();
  const detail = useQuery(instrumentQueryOptions(id));
  useDocumentTitle('QR label');

  if (detail.isPending) return <PageSpinner label="Loading the instrument…" />;
  if (detail.isError) return <ErrorState title="The instrument could not be loaded" error={detail.error} onRetry={() => void detail.refetch()} />;

  // the code opens the instrument page without a shop in the address, so it works for anyone who may read it
  const url = `${window.location.origin}/registry/instruments/${detail.data.instrument.id}`;
  return (
    <>
      <style>{PRINT_CSS}</style>
      <PageHeader
        title="QR label"
        description="Stick it inside the case lid. A phone camera opens this instrument’s page from it."
        actions={
          <>
            <Button onClick={() => window.print()}>Print</Button>
            <ButtonLink variant="secondary" to={withShop(`/registry/instruments/${id}`, currentShop?.id)}>
              Back to the instrument
            </ButtonLink>
          </>
        }
      />
      <QrLabel detail={detail.data} url={url} networkName={me.network.name} />
    </>
  );
}
