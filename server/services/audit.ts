import { listAudit as auditRows } from '../repositories/audit.js';
import type { Db, PageRequest } from '../repositories/db.js';

export { recordAudit, type AuditEntry } from '../repositories/audit.js';

export async function listAudit(db: Db, opts: PageRequest & { entityType?: string; entityId?: string; action?: string }) {
  const { total, rows } = await auditRows(db, opts);
  return {
    total,
    items: rows.map((r) => ({
      id: r.id,
      at: r.at,
      actorId: r.actor_id,
      actorLogin: r.actor_login ?? null,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      details: r.details,
    })),
  };
}
