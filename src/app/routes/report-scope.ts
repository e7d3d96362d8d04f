import { subject } from '@casl/ability';
import { useCallback } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useAppAbility } from '@/lib/ability';
import { useSession } from '../session-context';

/**
 * The shop a report page covers, from `?scope=<shop id>` (absent: all the person's shops). Kept apart
 * from the app's `?shop=`, which is the shop the person works in and which the reports leave alone.
 * Only shops whose figures the rules allow are offered; a stale or foreign id falls back to all.
 */
export function useReportScope(action: 'read' | 'export' = 'read') {
  const me = useSession();
  const ability = useAppAbility();
  const [params, setParams] = useSearchParams();
  const shops = me.shops.filter((s) => ability.can(action, subject('Report', { shopId: s.id })));
  const raw = params.get('scope');
  const shop = raw && shops.some((s) => s.id === raw) ? raw : undefined;
  const setShop = useCallback(
    (id: string | undefined) =>
      setParams((previous) => {
        const next = new URLSearchParams(previous);
        if (id) next.set('scope', id);
        else next.delete('scope');
        return next;
      }),
    [setParams],
  );
  return { shops, shop, setShop, shopName: shops.find((s) => s.id === shop)?.name };
}

/**
 * Whether the person may download the CSV files of this scope: a file needs `export` on Report (the server
 * refuses it otherwise), which technicians and auditors lack even where they read the figures.
 */
export function useMayExport(shop: string | undefined): boolean {
  const me = useSession();
  const ability = useAppAbility();
  const exportable = me.shops.filter((s) => ability.can('export', subject('Report', { shopId: s.id })));
  return shop ? exportable.some((s) => s.id === shop) : exportable.length > 0;
}
