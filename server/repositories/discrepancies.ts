import type { Knex } from 'knex';
import type { Db } from './db.js';
import type { DiscrepancyRow } from './rows.js';

export interface NewDiscrepancy {
  path: string;
  field: string;
  label: string;
  valueA: unknown;
  valueB: unknown;
}

export async function insertDiscrepancies(trx: Knex.Transaction, assignmentId: number, found: NewDiscrepancy[]): Promise<void> {
  if (!found.length) return;
  await trx('discrepancies').insert(
    found.map((d) => ({ assignment_id: assignmentId, path: d.path, field: d.field, label: d.label, value_a: JSON.stringify(d.valueA), value_b: JSON.stringify(d.valueB) })),
  );
}

export async function discrepanciesOf(db: Db, assignmentId: number): Promise<(DiscrepancyRow & { resolved_by_login: string | null })[]> {
  return db('discrepancies as d').leftJoin('users as u', 'u.id', 'd.resolved_by').where('d.assignment_id', assignmentId).orderBy('d.id').select('d.*', 'u.login as resolved_by_login');
}

export async function findDiscrepancy(db: Db, assignmentId: number, id: number): Promise<DiscrepancyRow | undefined> {
  return db<DiscrepancyRow>('discrepancies').where({ id, assignment_id: assignmentId }).first();
}

export async function resolveDiscrepancyRow(trx: Knex.Transaction, id: number, r: { resolution: 'a' | 'b' | 'value'; value: unknown; rationale: string; actorId: number }): Promise<DiscrepancyRow> {
  const [row] = await trx('discrepancies')
    .where({ id })
    .update({ status: 'resolved', resolution: r.resolution, resolved_value: JSON.stringify(r.value ?? null), rationale: r.rationale, resolved_by: r.actorId, resolved_at: trx.fn.now() })
    .returning('*');
  return row;
}
