import type { Knex } from 'knex';

export interface AuditEntry {
  actorId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  details?: Record<string, unknown>;
}

/** Appends to the audit log; pass the transaction of the change so both land or neither does. */
export async function recordAudit(db: Knex | Knex.Transaction, entry: AuditEntry): Promise<void> {
  await db('audit_log').insert({
    actor_id: entry.actorId,
    action: entry.action,
    entity_type: entry.entityType,
    entity_id: entry.entityId == null ? null : String(entry.entityId),
    details: JSON.stringify(entry.details ?? {}),
  });
}

export async function listAudit(
  db: Knex,
  opts: { page: number; pageSize: number; entityType?: string; entityId?: string; action?: string },
) {
  const base = db('audit_log').modify((qb) => {
    if (opts.entityType) qb.where('entity_type', opts.entityType);
    if (opts.entityId) qb.where('entity_id', opts.entityId);
    if (opts.action) qb.where('action', opts.action);
  });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const items = await base
    .clone()
    .leftJoin('users', 'users.id', 'audit_log.actor_id')
    .select('audit_log.*', 'users.login as actor_login')
    .orderBy('audit_log.id', 'desc')
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return {
    total: Number(count),
    items: items.map((r: Record<string, any>) => ({
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
