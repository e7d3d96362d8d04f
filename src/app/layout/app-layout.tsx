import { useEffect, useId, useState } from 'react';
import { NavLink, Outlet, useLocation } from 'react-router-dom';
import { rolesAtShop, describeRoles } from '@/features/session/roles';
import { SignOutButton } from '@/features/session/components/sign-out-button';
import { ShopSwitcher } from '@/features/shops/components/shop-switcher';
import { InboxLink } from '@/features/notifications/components/inbox-link';
import { useAppAbility } from '@/lib/ability';
import { cn } from '@/lib/cn';
import { useCurrentShop, withShop } from '../current-shop';
import { visibleNavItems } from '../navigation';
import { useSession } from '../session-context';
import { Brand } from './brand';
import { DevMailLink } from './dev-mail-link';
import { MAIN_CONTENT_ID, SkipLink } from './skip-link';

export function AppLayout() {
  const me = useSession();
  const ability = useAppAbility();
  const { currentShop, setCurrentShop } = useCurrentShop();
  const location = useLocation();
  const menuId = useId();
  // The phone menu is open only on the page it was opened on, so it closes once a link has taken the
  // person somewhere.
  const [menuOpenAt, setMenuOpenAt] = useState<string | null>(null);
  const menuOpen = menuOpenAt === location.pathname;

  useEffect(() => {
    if (!menuOpen) return;
    const onKeyDown = (event: KeyboardEvent) => {
      if (event.key === 'Escape') setMenuOpenAt(null);
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [menuOpen]);

  const items = visibleNavItems(ability);
  const roles = describeRoles(rolesAtShop(me.memberships, currentShop?.id));

  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <header className="border-b border-paper-200 bg-white">
        {/*
          One set of controls for every width: on phones the order utilities put the shop switcher on its
          own row under the name and fold the navigation and account into the menu, the inbox staying in
          sight beside the menu button; from lg up it is two rows, the navigation on its own.
        */}
        <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-6 gap-y-3 px-4 py-3 sm:px-6">
          <div className="order-1">
            <Brand to={withShop('/', currentShop?.id)} subtitle={me.network.name} />
          </div>

          <InboxLink to={withShop('/inbox', currentShop?.id)} className="order-2 ml-auto lg:order-4 lg:ml-0" />

          <button
            type="button"
            className="order-2 inline-flex min-h-11 items-center gap-2 rounded-lg border border-paper-300 px-4 text-sm font-semibold text-ink-950 hover:bg-paper-50 lg:hidden"
            aria-expanded={menuOpen}
            aria-controls={`${menuId}-nav ${menuId}-account`}
            onClick={() => setMenuOpenAt(menuOpen ? null : location.pathname)}
          >
            <svg className="size-5" viewBox="0 0 20 20" fill="none" aria-hidden="true">
              {menuOpen ? (
                <path d="m5 5 10 10M15 5 5 15" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
              ) : (
                <path d="M3 6h14M3 10h14M3 14h14" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
              )}
            </svg>
            Menu
          </button>

          <ShopSwitcher
            className="order-3 w-full lg:order-3 lg:ml-auto lg:w-auto"
            shops={me.shops}
            currentShopId={currentShop?.id}
            onChange={setCurrentShop}
          />

          <div
            id={`${menuId}-nav`}
            className={cn(
              'order-4 w-full flex-col gap-4 border-t border-paper-200 pt-3',
              'lg:order-6 lg:flex lg:w-full lg:flex-row lg:items-center lg:border-t lg:pt-2',
              menuOpen ? 'flex' : 'hidden',
            )}
          >
            <nav aria-label="Main" className="lg:flex-1">
              <ul className="flex flex-col gap-1 lg:flex-row lg:flex-wrap">
                {items.map((item) => (
                  <li key={item.to}>
                    <NavLink
                      to={withShop(item.to, currentShop?.id)}
                      end={item.end}
                      className={({ isActive }) =>
                        cn(
                          'flex min-h-11 items-center whitespace-nowrap rounded-lg px-3 font-semibold',
                          isActive ? 'bg-accent-50 text-accent-800' : 'text-ink-800 hover:bg-paper-100 hover:text-ink-950',
                        )
                      }
                    >
                      {item.label}
                    </NavLink>
                  </li>
                ))}
              </ul>
            </nav>
          </div>

          <div
            id={`${menuId}-account`}
            className={cn(
              'order-5 w-full items-center justify-between gap-4 border-t border-paper-200 pt-3',
              'lg:order-5 lg:flex lg:w-auto lg:justify-end lg:border-0 lg:pt-0',
              menuOpen ? 'flex' : 'hidden',
            )}
          >
            <div className="flex flex-col text-sm leading-tight lg:items-end">
              <span className="font-semibold text-ink-950">{me.user.name}</span>
              {roles ? <span className="text-ink-600">{roles}</span> : null}
            </div>
            <SignOutButton variant="quiet" />
          </div>
        </div>
      </header>

      <main id={MAIN_CONTENT_ID} tabIndex={-1} className="mx-auto w-full max-w-page flex-1 px-4 py-8 outline-none sm:px-6 sm:py-10">
        <Outlet />
      </main>

      <footer className="mx-auto w-full max-w-page px-4 pb-6 sm:px-6">
        <DevMailLink />
      </footer>
    </div>
  );
}
