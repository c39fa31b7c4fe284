import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { AuditRow } from './rows.js';

export interface AuditEntry {
  actorId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  details?: Record<string, unknown>;
}

/** Appends to the audit log; pass the transaction of the change so both land or neither does. */
export async function recordAudit(db: Db, entry: AuditEntry): Promise<void> {
  await db('audit_log').insert({
    actor_id: entry.actorId,
    action: entry.action,
    entity_type: entry.entityType,
    entity_id: entry.entityId == null ? null : String(entry.entityId),
    details: JSON.stringify(entry.details ?? {}),
  });
}

export async function listAudit(db: Db, opts: PageRequest & { entityType?: string; entityId?: string; action?: string }) {
  const base = db<AuditRow>('audit_log').modify((qb) => {
    if (opts.entityType) qb.where('entity_type', opts.entityType);
    if (opts.entityId) qb.where('entity_id', opts.entityId);
    if (opts.action) qb.where('action', opts.action);
  });
  const total = await countRows(base);
  const rows: (AuditRow & { actor_login: string | null })[] = await pageOf(
    base.clone().leftJoin('users', 'users.id', 'audit_log.actor_id').select('audit_log.*', 'users.login as actor_login').orderBy('audit_log.id', 'desc'),
    opts,
  );
  return { total, rows };
}
