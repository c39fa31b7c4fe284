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

export interface AuditFilter {
  entityType?: string;
  entityId?: string;
  action?: string;
  /** the login of who acted; 'system' for entries without a person */
  actor?: string;
  /** first and last day (YYYY-MM-DD, UTC), both included */
  from?: string;
  to?: string;
}

export async function listAudit(db: Db, opts: PageRequest & AuditFilter) {
  const base = db<AuditRow>('audit_log').modify((qb) => {
    if (opts.entityType) qb.where('audit_log.entity_type', opts.entityType);
    if (opts.entityId) qb.where('audit_log.entity_id', opts.entityId);
    if (opts.action) qb.where('audit_log.action', opts.action);
    if (opts.actor === 'system') qb.whereNull('audit_log.actor_id');
    else if (opts.actor) qb.whereIn('audit_log.actor_id', db('users').select('id').whereRaw('lower(login) = lower(?)', [opts.actor]));
    if (opts.from) qb.where('audit_log.at', '>=', db.raw("(?::date)::timestamp AT TIME ZONE 'UTC'", [opts.from]));
    if (opts.to) qb.where('audit_log.at', '<', db.raw("((?::date) + 1)::timestamp AT TIME ZONE 'UTC'", [opts.to]));
  });
  const total = await countRows(base);
  const rows: (AuditRow & { actor_login: string | null })[] = await pageOf(
    base.clone().leftJoin('users', 'users.id', 'audit_log.actor_id').select('audit_log.*', 'users.login as actor_login').orderBy('audit_log.id', 'desc'),
    opts,
  );
  return { total, rows };
}
