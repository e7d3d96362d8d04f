import { subject } from '@casl/ability';
import { Card, CardTitle } from '@/components/ui/card';
import { useAppAbility } from '@/lib/ability';

/**
 * What the signed-in person may do at one shop, read from the same rules the server enforces.
 * Each line is one check against a record of that shop, so a person with different roles at two
 * shops sees two different lists.
 */
const CHECKS: Array<{ label: string; action: string; type: string; field: string }> = [
  { label: 'Open jobs and write estimates', action: 'create', type: 'Job', field: 'shopId' },
  { label: 'Register customers', action: 'create', type: 'Customer', field: 'homeShopId' },
  { label: 'Register and update instruments', action: 'update', type: 'Instrument', field: 'currentShopId' },
  { label: 'See customers’ contact details', action: 'read', type: 'CustomerContact', field: 'homeShopId' },
  { label: 'Move jobs through the bench stages', action: 'move_stage', type: 'Job', field: 'shopId' },
  { label: 'Record pad maps', action: 'create', type: 'PadMap', field: 'shopId' },
  { label: 'Add photos and documents', action: 'create', type: 'Attachment', field: 'shopId' },
  { label: 'Request transfers to other shops', action: 'request', type: 'Transfer', field: 'fromShopId' },
  { label: 'Approve transfers', action: 'approve', type: 'Transfer', field: 'fromShopId' },
  { label: 'Manage stock', action: 'update', type: 'Stock', field: 'shopId' },
  { label: 'Read jobs and stock', action: 'read', type: 'Stock', field: 'shopId' },
];

export function shopAbilities(ability: ReturnType<typeof useAppAbility>, shopId: string): string[] {
  return CHECKS.filter((c) => ability.can(c.action, subject(c.type, { [c.field]: shopId }))).map((c) => c.label);
}

export function ShopAbilities({ shopId, shopName }: { shopId: string; shopName: string }) {
  const ability = useAppAbility();
  const allowed = shopAbilities(ability, shopId);
  return (
    <Card as="section" aria-labelledby="shop-abilities-heading">
      <CardTitle id="shop-abilities-heading">What you can do here</CardTitle>
      <p className="mt-1 text-ink-600">At {shopName}, from the roles you hold there.</p>
      {allowed.length === 0 ? (
        <p className="mt-3 text-ink-600">Nothing at this shop yet.</p>
      ) : (
        <ul className="mt-3 grid grid-cols-1 gap-2 sm:grid-cols-2" aria-label={`Allowed at ${shopName}`}>
          {allowed.map((label) => (
            <li key={label} className="flex items-start gap-2 text-ink-800">
              <svg className="mt-1 size-4 shrink-0 text-accent-600" viewBox="0 0 16 16" fill="none" aria-hidden="true">
                <path d="m3 8.5 3 3 7-7" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
              </svg>
              {label}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
