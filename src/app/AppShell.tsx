import { useEffect, useState } from 'react';
import { NavLink, Outlet, useLocation, useNavigation } from 'react-router-dom';
import { ROLE_LABELS, hasRole } from '../../shared/roles';
import { useMe } from '../features/auth/api/get-me';
import { useSignOut } from '../features/auth/api/sign-out';
import { signInHref } from '../lib/sign-in';
import { NAV_ITEMS } from './nav';

export function AppShell() {
  const { data: me } = useMe();
  const signOut = useSignOut();
  // A screen's loader is fetching its data: the page shown stays until it arrives.
  const navigating = useNavigation().state !== 'idle';
  // Below the md breakpoint the links fold into a menu that a button opens; a new page closes it.
  const [menuOpen, setMenuOpen] = useState(false);
  const { pathname } = useLocation();
  useEffect(() => setMenuOpen(false), [pathname]);
  const links = NAV_ITEMS.filter((n) => (n.role ? !!me && [n.role].flat().some((r) => hasRole(me.roles, r)) : n.signedIn ? !!me : true));
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only">
        Skip to content
      </a>
      <header className="border-b border-paper-edge bg-paper-deep">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2">
          <NavLink to="/" className="font-reading text-xl font-bold text-ink no-underline">
            Chronometa
          </NavLink>
          <button
            type="button"
            className="ml-auto rounded border border-paper-edge px-2 py-1 text-sm md:hidden"
            aria-expanded={menuOpen}
            aria-controls="main-menu"
            onClick={() => setMenuOpen((o) => !o)}
          >
            {menuOpen ? '✕ Close menu' : '☰ Menu'}
          </button>
          <nav
            id="main-menu"
            aria-label="Main"
            className={`${menuOpen ? 'flex' : 'hidden'} w-full flex-col gap-2 py-1 text-sm md:flex md:w-auto md:flex-row md:flex-wrap md:gap-4 md:py-0`}
          >
            {links.map((l) => (
              <NavLink key={l.to} to={l.to} className={({ isActive }) => (isActive ? 'font-semibold text-ink' : '')}>
                {l.label}
              </NavLink>
            ))}
          </nav>
          <div className="flex flex-wrap items-center gap-3 text-sm md:ml-auto">
            {me ? (
              <>
                <span>
                  <strong>{me.name ?? me.login}</strong>{' '}
                  <span className="text-ink-soft">({me.roles.filter((r) => r !== 'reader' || me.roles.length === 1).map((r) => ROLE_LABELS[r]).join(', ')})</span>
                </span>
                <button type="button" className="underline" onClick={() => signOut.mutate()}>
                  Sign out
                </button>
              </>
            ) : (
              <a href={signInHref()}>Sign in</a>
            )}
          </div>
        </div>
      </header>
      <div className={`h-0.5 ${navigating ? 'animate-pulse bg-action' : 'bg-transparent'}`} role="progressbar" aria-label="Opening the page" aria-hidden={!navigating} />
      <main id="main" className="mx-auto max-w-7xl px-4 py-5" aria-busy={navigating}>
        <Outlet />
      </main>
      <footer className="mx-auto max-w-7xl px-4 py-6 text-xs text-ink-faint">
        Chronometa is a research-synthesis registry. Its estimates are not clinical guidance; for any clinical use defer to licensed practice and local guidelines.
      </footer>
    </div>
  );
}
