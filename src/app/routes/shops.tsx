import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { ShopTable } from '@/features/shops/components/shop-table';
import { SkillsCatalog } from '@/features/shops/components/skills-catalog';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** `/shops` (owner): every shop with its load, the way to open a new one, and the network's skills. */
export function ShopsRoute() {
  const me = useSession();
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  useDocumentTitle('Shops');
  return (
    <>
      <PageHeader
        title="Shops"
        description={`Every shop in ${me.network.name}, with the load on its job board. Open a shop to edit its details, skills, technicians and relay runs.`}
        actions={ability.can('create', 'Shop') ? <ButtonLink to={withShop('/shops/new', currentShop?.id)}>New shop</ButtonLink> : null}
      />
      <div className="flex flex-col gap-8">
        <ShopTable hrefFor={(id) => withShop(`/shops/${id}`, currentShop?.id)} />
        <SkillsCatalog />
      </div>
    </>
  );
}
