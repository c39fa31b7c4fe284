import { AuditTable } from '../../features/audit/components/AuditTable';
import { RequireRole } from './RequireRole';

export function AuditPage() {
  return (
    <RequireRole role="curator">
      <h1>Audit log</h1>
      <p className="mb-3 text-sm text-ink-soft">Every change to the registry, newest first. Entries are never changed or removed.</p>
      <AuditTable />
    </RequireRole>
  );
}
