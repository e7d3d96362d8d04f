import { PageHeader } from '@/components/ui/page-header';
import { PadRulesForm } from '@/features/padmap/components/pad-rules-form';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';

/** /pad-rules — the network's rules for choosing pads and stems, set by the owner. */
export function PadRulesRoute() {
  const ability = useAppAbility();
  useDocumentTitle('Pad rules');
  return (
    <>
      <PageHeader
        title="Pad rules"
        description="How every pad map of the network chooses pad diameters and stem heights, and how it estimates labor. Changes apply to the next preview and save; saved maps keep what they stored."
      />
      <PadRulesForm canEdit={ability.can('update', 'Network')} />
    </>
  );
}
