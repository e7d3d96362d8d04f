import { useId } from 'react';
import { cn } from '@/lib/cn';

export interface SwitchableShop {
  id: string;
  name: string;
  city: string;
}

interface ShopSwitcherProps {
  shops: SwitchableShop[];
  currentShopId: string | undefined;
  onChange: (shopId: string) => void;
  className?: string;
}

/**
 * A native select: it is the most dependable control on phones (the system picker) and for
 * keyboards and screen readers, and it needs no custom popup code.
 */
export function ShopSwitcher({ shops, currentShopId, onChange, className }: ShopSwitcherProps) {
  const id = useId();
  if (shops.length === 0) {
    return <p className={cn('text-sm text-ink-600', className)}>No shops yet</p>;
  }
  return (
    <div className={cn('flex items-center gap-2', className)}>
      <label htmlFor={id} className="text-sm font-medium text-ink-600">
        Shop
      </label>
      <div className="relative w-full sm:w-auto">
        <select
          id={id}
          value={currentShopId ?? ''}
          onChange={(event) => onChange(event.target.value)}
          className={cn(
            'min-h-11 w-full appearance-none rounded-lg border border-paper-300 bg-white py-2 pr-10 pl-3',
            'text-sm font-semibold text-ink-950 hover:border-ink-400 sm:min-w-56',
          )}
        >
          {shops.map((shop) => (
            <option key={shop.id} value={shop.id}>
              {shop.name} · {shop.city}
            </option>
          ))}
        </select>
        <svg
          className="pointer-events-none absolute top-1/2 right-3 size-4 -translate-y-1/2 text-ink-600"
          viewBox="0 0 16 16"
          fill="none"
          aria-hidden="true"
        >
          <path d="m4 6 4 4 4-4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      </div>
    </div>
  );
}
