import { listAudit as auditRows, type AuditFilter } from '../repositories/audit.js';
import type { AuditPage } from '../../shared/schemas/admin.js';
import { pageOf } from '../../shared/schemas/common.js';
import { iso, type Db, type PageRequest } from '../repositories/db.js';

export { recordAudit, type AuditEntry } from '../repositories/audit.js';

export async function listAudit(db: Db, opts: PageRequest & AuditFilter): Promise<AuditPage> {
  const { total, rows } = await auditRows(db, opts);
  return pageOf(
    rows.map((r) => ({
      id: r.id,
      at: iso(r.at),
      actorId: r.actor_id,
      actorLogin: r.actor_login ?? null,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      details: r.details,
    })),
    total,
    opts,
  );
}
