import { NavLink, Outlet, useNavigation } from 'react-router-dom';
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
          <nav aria-label="Main" className="flex flex-wrap gap-4 text-sm">
            {links.map((l) => (
              <NavLink key={l.to} to={l.to} className={({ isActive }) => (isActive ? 'font-semibold text-ink' : '')}>
                {l.label}
              </NavLink>
            ))}
          </nav>
          <div className="ml-auto flex items-center gap-3 text-sm">
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
