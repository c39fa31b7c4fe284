import { UsersTable } from '../../features/admin/components/UsersTable';
import { RequireRole } from './RequireRole';

export function AdminPeoplePage() {
  return (
    <RequireRole role="admin">
      <h1>People and roles</h1>
      <p className="mb-3 text-sm text-ink-soft">Tick a box to grant a role, untick to remove it. Every change is written to the audit log. A role held through another (an administrator holds every role; a curator is also a contributor) is marked “✓ through …”.</p>
      <UsersTable />
    </RequireRole>
  );
}
