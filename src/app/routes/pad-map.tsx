import { useParams } from 'react-router-dom';
import { PadMapScreen } from '@/features/padmap/components/pad-map-screen';
import { useAppAbility } from '@/lib/ability';
import { useCurrentShop, withShop } from '../current-shop';

/** /jobs/:jobId/pad-map — the repad's key-by-key measurements for one job. */
export function PadMapRoute() {
  const { jobId = '' } = useParams();
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  return (
    <PadMapScreen
      jobId={jobId}
      jobHref={withShop(`/jobs/${jobId}`, currentShop?.id)}
      rulesHref={ability.can('update', 'Network') ? withShop('/pad-rules', currentShop?.id) : undefined}
    />
  );
}
