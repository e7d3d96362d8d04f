import { useParams } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { InstrumentPhotoComparison } from '@/features/files/components/instrument-photo-comparison';
import { useDocumentTitle } from '@/lib/use-document-title';

export function InstrumentPhotosRoute() {
  const { instrumentId = '' } = useParams();
  useDocumentTitle('Instrument photos');
  return (
    <>
      <PageHeader title="Instrument photos" description="Before and after, across every visit of this instrument." />
      <InstrumentPhotoComparison instrumentId={instrumentId} />
    </>
  );
}
