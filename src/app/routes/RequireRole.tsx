import type { ReactNode } from 'react';
import { hasRole, ROLE_LABELS, type Role } from '../../../shared/roles';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { useMe } from '../../features/auth/api/get-me';
import { signInHref } from '../../lib/sign-in';

/** Shows a screen only to people who may use it, and says why otherwise. */
export function RequireRole({ role, children }: { role?: Role; children: ReactNode }) {
  const { data: me, isLoading, error } = useMe();
  if (isLoading) return <Loading />;
  if (error) return <ErrorNote error={error} />;
  if (!me)
    return (
      <p>
        <a href={signInHref()}>Sign in</a> to see this page.
      </p>
    );
  if (role && !hasRole(me.roles, role)) return <ErrorNote error={`This page needs the ${ROLE_LABELS[role]} role.`} />;
  return <>{children}</>;
}
