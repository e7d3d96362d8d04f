import { useQuery } from '@tanstack/react-query';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { instrumentPhotosQueryOptions } from '../queries';
import { BeforeAfter } from './before-after';

/** For the instrument page: before and after across every visit of this serial the person may see. */
export function InstrumentPhotoComparison({ instrumentId }: { instrumentId: string }) {
  const photos = useQuery(instrumentPhotosQueryOptions(instrumentId));
  if (photos.isPending) return <Spinner label="Loading photos…" showLabel />;
  if (photos.isError) return <ErrorState title="Photos could not be loaded" error={photos.error} onRetry={() => void photos.refetch()} />;
  if (!photos.data.length) return <p className="text-ink-600">No photos of this instrument yet.</p>;
  return <BeforeAfter photos={photos.data} title="Before and after, across visits" />;
}
