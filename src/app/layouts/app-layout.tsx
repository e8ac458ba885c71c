import { useEffect, useRef, useState } from 'react';
import { NavLink, Outlet, redirect, useLocation, useNavigate, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { sessionQueries, useSession, useSignOut } from '@/features/auth/api';
import { IdleWarning } from './idle-warning';
import { Icon } from '@/components/ui/icon';
import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { navItemForPath, navItemsFor, ROLE_LABELS, type NavItem } from '../nav';
import { paths, signInPath } from '../paths';

/** Only members with a session get past this layout; everyone else goes to sign-in and comes back. */
export const appLayoutLoader = (qc: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const info = await qc.ensureQueryData(sessionQueries.current());
  if (!info.user) {
    const url = new URL(request.url);
    throw redirect(signInPath(url.pathname + url.search));
  }
  return null;
};

function NavList({ items, onNavigate, layout }: { items: NavItem[]; onNavigate?: () => void; layout: 'sidebar' | 'menu' }) {
  return (
    <ul className={cn(layout === 'menu' ? 'grid grid-cols-1 gap-1 sm:grid-cols-2' : 'space-y-1')}>
      {items.map((item) => (
        <li key={item.to}>
          <NavLink
            to={item.to}
            end={item.to === paths.kitchen}
            onClick={onNavigate}
            className={({ isActive }) =>
              cn(
                'flex min-h-11 items-center gap-3 rounded-control px-3 py-2 no-underline',
                isActive ? 'bg-berry-soft font-bold text-berry' : 'text-ink hover:bg-berry-soft',
              )
            }
          >
            <Icon name={item.icon} />
            <span>{item.label}</span>
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

/** The signed-in frame: header, navigation (sidebar on desktop, a menu on phone and tablet), main. */
export function AppLayout() {
  const session = useSession();
  const user = session.user!;
  const items = navItemsFor(user.role);
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut();
  const [isMenuOpen, setMenuOpen] = useState(false);
  const mainRef = useRef<HTMLElement>(null);
  const isFirstPath = useRef(true);

  // After a client-side navigation, move focus to the new screen so keyboard and screen-reader users start there.
  useEffect(() => {
    if (isFirstPath.current) {
      isFirstPath.current = false;
      return;
    }
    setMenuOpen(false);
    const heading = mainRef.current?.querySelector('h1');
    if (heading) {
      heading.setAttribute('tabindex', '-1');
      heading.focus({ preventScroll: false });
    } else mainRef.current?.focus();
  }, [location.pathname]);

  const current = navItemForPath(location.pathname);
  const isAllowed = !current || current.roles.includes(user.role);

  const doSignOut = () =>
    signOut.mutate(undefined, { onSettled: () => navigate(signInPath(undefined, 'signed-out'), { replace: true }) });

  return (
    <div className="min-h-screen">
      <a href="#main" className="skip-link sr-only focus:not-sr-only focus:fixed focus:left-4 focus:top-4 focus:z-50 focus:rounded-control focus:bg-surface focus:p-3">
        Skip to main content
      </a>
      <header className="sticky top-0 z-30 border-b border-hairline bg-surface" data-print="hide">
        <div className="flex min-h-16 items-center gap-3 px-4 py-2">
          <button
            type="button"
            className="inline-flex min-h-11 items-center gap-2 rounded-control border border-edge px-3 font-bold lg:hidden"
            aria-expanded={isMenuOpen}
            aria-controls="site-menu"
            onClick={() => setMenuOpen((o) => !o)}
          >
            <Icon name={isMenuOpen ? 'close' : 'menu'} />
            Menu
          </button>
          <div className="min-w-0 flex-1">
            <p className="truncate text-lg font-black leading-tight" title={session.business?.name}>
              {session.business?.name ?? 'Crumbtrail'}
            </p>
            <p className="truncate text-sm text-muted">
              <span className="font-bold text-ink">{user.displayName}</span> · {ROLE_LABELS[user.role]}
              {session.business?.isDemo ? ' · demo data' : ''}
            </p>
          </div>
          <Button variant="secondary" icon={<Icon name="signOut" />} isBusy={signOut.isPending} onClick={doSignOut}>
            Sign out
          </Button>
        </div>
        {isMenuOpen ? (
          <nav id="site-menu" aria-label="Main" className="border-t border-hairline px-4 py-3 lg:hidden">
            <NavList items={items} layout="menu" onNavigate={() => setMenuOpen(false)} />
          </nav>
        ) : null}
      </header>
      <div className="lg:flex">
        <nav aria-label="Main" className="hidden w-60 shrink-0 border-r border-hairline bg-surface px-3 py-4 lg:sticky lg:top-16 lg:block lg:h-[calc(100vh-4rem)] lg:overflow-y-auto">
          <NavList items={items} layout="sidebar" />
        </nav>
        <main id="main" ref={mainRef} tabIndex={-1} className="min-w-0 flex-1 px-4 py-6 sm:px-6 lg:px-10">
          <div className="mx-auto max-w-6xl">
            {isAllowed ? (
              <Outlet />
            ) : (
              <section role="alert" className="rounded-card border border-edge bg-surface p-6">
                <h1 className="text-2xl font-bold">Not available for your role</h1>
                <p className="mt-2">
                  {current.label} is for {current.roles.map((r) => `${ROLE_LABELS[r].toLowerCase()}s`).join(' and ')}. Ask the business owner if you need it.
                </p>
              </section>
            )}
          </div>
        </main>
      </div>
      <IdleWarning idleExpiresAt={session.idleExpiresAt} absoluteExpiresAt={session.absoluteExpiresAt} />
    </div>
  );
}
