import type { Knex } from 'knex';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import { claimsJson } from './extractions.js';
import type { AssignmentRow, AssignmentState, RefRow } from './rows.js';

export async function findAssignment(db: Db, id: number): Promise<AssignmentRow | undefined> {
  return db<AssignmentRow>('assignments').where({ id }).first();
}

export async function lockAssignment(trx: Knex.Transaction, id: number): Promise<AssignmentRow | undefined> {
  return trx<AssignmentRow>('assignments').where({ id }).forUpdate().first();
}

/** The pair currently coding (or disputing) a reference, if any. */
export async function activeAssignmentOf(db: Db, referenceId: number): Promise<Pick<AssignmentRow, 'id'> | undefined> {
  return db<AssignmentRow>('assignments').where({ reference_id: referenceId }).whereIn('state', ['coding', 'disputed']).first('id');
}

export async function insertAssignment(trx: Knex.Transaction, a: Pick<AssignmentRow, 'reference_id' | 'coder1_id' | 'coder2_id' | 'assigned_by'>): Promise<AssignmentRow> {
  const [row] = await trx('assignments').insert(a).returning('*');
  return row;
}

/** Moves a pair to a new state (and version). */
export async function setAssignmentState(trx: Knex.Transaction, a: Pick<AssignmentRow, 'id' | 'version'>, state: AssignmentState): Promise<void> {
  await trx('assignments').where({ id: a.id }).update({ state, version: a.version + 1, updated_at: trx.fn.now() });
}

/** A change inside a pair (a discrepancy decided): the version moves so a form read before it is stale. */
export async function touchAssignment(trx: Knex.Transaction, a: Pick<AssignmentRow, 'id' | 'version'>): Promise<void> {
  await trx('assignments').where({ id: a.id }).update({ version: a.version + 1, updated_at: trx.fn.now() });
}

type PairListRow = AssignmentRow & Pick<RefRow, 'title' | 'first_author' | 'year'> & { coder1: string; coder2: string; open_discrepancies: number; submitted: number };

export async function listAssignments(db: Db, q: PageRequest & { state?: AssignmentState; sort: 'id' | 'updated' | 'reference'; order: 'asc' | 'desc' }) {
  const base = db('assignments as a').join('refs as r', 'r.id', 'a.reference_id').modify((qb) => {
    if (q.state) qb.where('a.state', q.state);
  });
  const total = await countRows(base);
  const sort = { id: 'a.id', updated: 'a.updated_at', reference: 'r.first_author' }[q.sort];
  const rows: PairListRow[] = await pageOf(
    base
      .clone()
      .join('users as u1', 'u1.id', 'a.coder1_id')
      .join('users as u2', 'u2.id', 'a.coder2_id')
      .select('a.*', 'r.title', 'r.first_author', 'r.year', 'u1.login as coder1', 'u2.login as coder2')
      .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id and d.status = 'open') as open_discrepancies`))
      .select(db.raw(`(select count(*)::int from extractions x where x.assignment_id = a.id and x.kind = 'coding' and x.state <> 'draft') as submitted`))
      .orderBy(sort, q.order)
      .orderBy('a.id', 'asc'),
    q,
  );
  return { total, rows };
}

export interface CandidateClaim {
  extractionId: number;
  coderId: number;
  coder: string;
  state: 'draft' | 'submitted';
}

/** Included references with their coding status and claims, for a curator choosing what to assign. */
export async function listCandidates(db: Db, q: PageRequest & { q?: string; status?: 'unassigned' | 'any'; sort: 'reference' | 'year' | 'id'; order: 'asc' | 'desc' }) {
  const base = db('refs as r')
    .whereNull('r.merged_into')
    .where('r.screening_status', 'included')
    .modify((qb) => {
      if (q.q) qb.where((w) => w.whereILike('r.title', `%${q.q}%`).orWhereILike('r.first_author', `%${q.q}%`));
      if (q.status === 'unassigned') {
        qb.whereNotExists(db('assignments as a').whereRaw('a.reference_id = r.id').whereIn('a.state', ['coding', 'disputed']));
        qb.whereNotExists(db('extractions as x').whereRaw('x.reference_id = r.id').where('x.kind', 'settled').whereNull('x.superseded_by').where('x.state', 'settled'));
      }
    });
  const total = await countRows(base);
  const sort = { reference: 'r.first_author', year: 'r.year', id: 'r.id' }[q.sort];
  const rows: Array<Pick<RefRow, 'id' | 'title' | 'first_author' | 'year' | 'doi'> & { assignment_state: AssignmentState | null; settled: boolean; claims: CandidateClaim[] }> = await pageOf(
    base
      .clone()
      .select('r.id', 'r.title', 'r.first_author', 'r.year', 'r.doi')
      .select(db.raw(`(select a.state from assignments a where a.reference_id = r.id order by a.id desc limit 1) as assignment_state`))
      .select(db.raw(`exists(select 1 from extractions x where x.reference_id = r.id and x.kind = 'settled' and x.state = 'settled' and x.superseded_by is null) as settled`))
      .select(claimsJson(db))
      .orderBy(sort, q.order)
      .orderBy('r.id', 'asc'),
    q,
  );
  return { total, rows };
}

/** The reconciliation queue: disputed pairs with their discrepancy counts. */
export async function listDisputed(db: Db, q: PageRequest & { sort: 'updated' | 'reference' | 'open'; order: 'asc' | 'desc' }) {
  const base = db('assignments as a').join('refs as r', 'r.id', 'a.reference_id').where('a.state', 'disputed');
  const total = await countRows(base);
  const sort = { updated: 'a.updated_at', reference: 'r.first_author', open: 'open_discrepancies' }[q.sort];
  const rows: Array<Pick<AssignmentRow, 'id' | 'reference_id' | 'updated_at' | 'coder1_id' | 'coder2_id'> & Pick<RefRow, 'title' | 'first_author' | 'year'> & { coder1: string; coder2: string; open_discrepancies: number; discrepancies: number }> =
    await pageOf(
      base
        .clone()
        .join('users as u1', 'u1.id', 'a.coder1_id')
        .join('users as u2', 'u2.id', 'a.coder2_id')
        .select('a.id', 'a.reference_id', 'a.updated_at', 'a.coder1_id', 'a.coder2_id', 'r.title', 'r.first_author', 'r.year', 'u1.login as coder1', 'u2.login as coder2')
        .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id and d.status = 'open') as open_discrepancies`))
        .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id) as discrepancies`))
        .orderBy(sort, q.order)
        .orderBy('a.id', 'asc'),
      q,
    );
  return { total, rows };
}

export type PairDetailRow = AssignmentRow & Pick<RefRow, 'title' | 'first_author' | 'year' | 'doi'> & { coder1: string; coder2: string };

export async function findPairDetail(db: Db, id: number): Promise<PairDetailRow | undefined> {
  return db('assignments as a')
    .join('refs as r', 'r.id', 'a.reference_id')
    .join('users as u1', 'u1.id', 'a.coder1_id')
    .join('users as u2', 'u2.id', 'a.coder2_id')
    .where('a.id', id)
    .first('a.*', 'r.title', 'r.first_author', 'r.year', 'r.doi', 'u1.login as coder1', 'u2.login as coder2');
}

/** Pairs whose codings were compared (matched, disputed or settled), oldest first. */
export async function comparedPairs(db: Db, filter: { referenceId?: number; assignmentId?: number } = {}) {
  const rows: Array<Pick<AssignmentRow, 'id' | 'reference_id' | 'coder1_id' | 'coder2_id'> & Pick<RefRow, 'first_author' | 'year'> & { l1: string; l2: string }> = await db('assignments as a')
    .join('refs as r', 'r.id', 'a.reference_id')
    .join('users as u1', 'u1.id', 'a.coder1_id')
    .join('users as u2', 'u2.id', 'a.coder2_id')
    .whereIn('a.state', ['matched', 'disputed', 'settled'])
    .modify((q) => {
      if (filter.referenceId) q.where('a.reference_id', filter.referenceId);
      if (filter.assignmentId) q.where('a.id', filter.assignmentId);
    })
    .orderBy('a.id')
    .select('a.id', 'a.reference_id', 'a.coder1_id', 'a.coder2_id', 'r.first_author', 'r.year', 'u1.login as l1', 'u2.login as l2');
  return rows;
}
