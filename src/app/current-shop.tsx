import { createContext, useCallback, useContext, useEffect, useMemo, useRef, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { SessionShop } from '@/features/session/types';

/**
 * Which shop the person is working in.
 *
 * The address bar (`?shop=<id>`) is the source of truth, so a link or a bookmark opens the same shop
 * and two tabs can work in two shops side by side. localStorage remembers the last choice, so an
 * address without `?shop=` (a fresh visit, a plain link) opens where the person left off. A shop id
 * that is not among the person's shops (a stale bookmark, a role removed) is ignored and replaced.
 */
export const CURRENT_SHOP_STORAGE_KEY = 'benchrelay.currentShop';
export const SHOP_SEARCH_PARAM = 'shop';

interface CurrentShopValue {
  currentShop: SessionShop | undefined;
  setCurrentShop: (shopId: string) => void;
}

const CurrentShopContext = createContext<CurrentShopValue | null>(null);

function readRemembered(): string | null {
  try {
    return window.localStorage.getItem(CURRENT_SHOP_STORAGE_KEY);
  } catch {
    // Storage can be blocked (private modes, strict settings); the URL still works on its own.
    return null;
  }
}

function remember(shopId: string) {
  try {
    window.localStorage.setItem(CURRENT_SHOP_STORAGE_KEY, shopId);
  } catch {
    // See readRemembered.
  }
}

/**
 * `ownShopIds`: shops where the person holds a role. A regional manager may read every shop, but with
 * nothing in the address and nothing remembered the tab opens on one of their own, not the first by name.
 */
export function CurrentShopProvider({ shops, ownShopIds = [], children }: { shops: SessionShop[]; ownShopIds?: string[]; children: ReactNode }) {
  const [searchParams, setSearchParams] = useSearchParams();
  const fromUrl = searchParams.get(SHOP_SEARCH_PARAM);

  // the ids arrive as a new array on each render; their content is what matters
  const ownShopKey = ownShopIds.join(',');
  const currentShop = useMemo(() => {
    const own = ownShopKey.split(',');
    const byId = (id: string | null) => (id ? shops.find((shop) => shop.id === id) : undefined);
    return byId(fromUrl) ?? byId(readRemembered()) ?? shops.find((shop) => own.includes(shop.id)) ?? shops[0];
  }, [shops, fromUrl, ownShopKey]);

  // The shop this tab last settled on, read live (a ref, not a render's closure): the effect below may be
  // one of an earlier render that runs only after the person has already picked another shop.
  const settled = useRef<string | null>(null);

  useEffect(() => {
    if (!currentShop) return;
    // a stale run (its shop is neither the address's nor the one just picked) must not undo the pick
    const stale = settled.current && settled.current !== currentShop.id && fromUrl !== currentShop.id;
    if (stale && shops.some((shop) => shop.id === settled.current)) return;
    settled.current = currentShop.id;
    remember(currentShop.id);
    if (fromUrl !== currentShop.id) {
      setSearchParams(
        (previous) => {
          const next = new URLSearchParams(previous);
          next.set(SHOP_SEARCH_PARAM, currentShop.id);
          return next;
        },
        { replace: true },
      );
    }
  }, [currentShop, fromUrl, setSearchParams, shops]);

  const setCurrentShop = useCallback(
    (shopId: string) => {
      if (!shops.some((shop) => shop.id === shopId)) return;
      settled.current = shopId;
      remember(shopId);
      setSearchParams((previous) => {
        const next = new URLSearchParams(previous);
        next.set(SHOP_SEARCH_PARAM, shopId);
        return next;
      });
    },
    [shops, setSearchParams],
  );

  const value = useMemo(() => ({ currentShop, setCurrentShop }), [currentShop, setCurrentShop]);
  return <CurrentShopContext.Provider value={value}>{children}</CurrentShopContext.Provider>;
}

export function useCurrentShop(): CurrentShopValue {
  const value = useContext(CurrentShopContext);
  if (!value) throw new Error('useCurrentShop must be used below CurrentShopProvider');
  return value;
}

/** Adds the current shop to an in-app path, so moving between screens keeps the shop of this tab. */
export function withShop(path: string, shopId: string | undefined): string {
  if (!shopId) return path;
  const [pathname, query = ''] = path.split('?');
  const params = new URLSearchParams(query);
  params.set(SHOP_SEARCH_PARAM, shopId);
  return `${pathname}?${params.toString()}`;
}
