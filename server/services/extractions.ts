import type { Knex } from 'knex';
import { hasRole, type Role } from '../../shared/roles.js';
import { effectDraftSchema, studyDraftSchema, type Sheet } from '../../shared/schemas/extraction.js';
import { OUTCOMES, METRIC_LABELS } from '../../shared/vocabulary/outcomes.js';
import { METRIC_OF_FORM, tryComputeReported, type Reported } from '../../shared/extraction/compute.js';
import type { AppContext } from '../context.js';
import { bumpRegistry } from '../db/registry-version.js';
import { readSheet, toSheet, writeSheet } from '../db/sheets-repo.js';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors.js';
import { recordAudit } from './audit.js';
import { compareSheets } from './comparison.js';
import { curatorEmails, emailsOf, queueMails, type OutgoingMail } from './mail.js';
import { createSettledRecord, parseCompleteSheet } from './settlement.js';
import { resolveManipulations } from './manipulations.js';

export interface Actor {
  id: number;
  roles: Role[];
}

const refLabel = (r: { first_author?: string | null; year?: number | null }) => `${r.first_author ?? 'Anon.'} ${r.year ?? 'n.d.'}`;

async function loginOf(db: Knex | Knex.Transaction, id: number | null | undefined): Promise<string | null> {
  if (!id) return null;
  const row = await db('users').where({ id }).first('login');
  return row?.login ?? null;
}

/** 409 for an edit made against an old version, naming who changed it and when. */
async function staleEdit(db: Knex | Knex.Transaction, what: string, row: { version: number; updated_by?: number | null; updated_at?: Date | string }) {
  const who = await loginOf(db, row.updated_by);
  const when = row.updated_at ? new Date(row.updated_at).toISOString().slice(0, 16).replace('T', ' ') + ' UTC' : 'recently';
  return new ConflictError(`${what} was changed by ${who ?? 'someone else'} at ${when} (now version ${row.version}); reload to see their changes before saving again.`, {
    currentVersion: row.version,
    changedBy: who,
  });
}

// ---------------------------------------------------------------- assignments

export async function createAssignment(ctx: AppContext, actorId: number, input: { referenceId: number; coder1Id: number; coder2Id: number }) {
  const result = await ctx.db.transaction(async (trx) => {
    const ref = await trx('refs').where({ id: input.referenceId }).first();
    if (!ref) throw new NotFoundError(`No reference ${input.referenceId}.`);
    if (ref.merged_into) throw new UnprocessableError(`Reference ${input.referenceId} was merged into ${ref.merged_into}; assign that one.`);
    const coders = await trx('users as u')
      .leftJoin('user_roles as r', 'r.user_id', 'u.id')
      .whereIn('u.id', [input.coder1Id, input.coder2Id])
      .select('u.id', 'u.login', 'u.email', trx.raw('coalesce(array_agg(r.role) filter (where r.role is not null), \'{}\') as roles'))
      .groupBy('u.id');
    for (const [key, id] of [['coder1Id', input.coder1Id], ['coder2Id', input.coder2Id]] as const) {
      const c = coders.find((x: any) => x.id === id);
      if (!c) throw new ValidationError(`No user ${id}.`, [{ path: `body.${key}`, message: 'no such user' }]);
      if (!hasRole(c.roles, 'contributor')) throw new ValidationError(`${c.login} is not a contributor and cannot code.`, [{ path: `body.${key}`, message: 'needs the contributor role' }]);
    }
    const active = await trx('assignments').where({ reference_id: input.referenceId }).whereIn('state', ['coding', 'disputed']).first('id');
    if (active) throw new ConflictError(`Reference ${input.referenceId} is already being double coded (assignment ${active.id}).`);
    const [assignment] = await trx('assignments')
      .insert({ reference_id: input.referenceId, coder1_id: input.coder1Id, coder2_id: input.coder2Id, assigned_by: actorId })
      .returning('*');
    // A coder who already claimed the reference keeps that sheet; it joins the pair.
    const claimed: { id: number; coder_id: number }[] = await trx('extractions')
      .where({ reference_id: input.referenceId, kind: 'coding' })
      .whereNull('assignment_id')
      .whereIn('coder_id', [input.coder1Id, input.coder2Id])
      .where('state', 'draft')
      .select('id', 'coder_id');
    if (claimed.length) await trx('extractions').whereIn('id', claimed.map((c) => c.id)).update({ assignment_id: assignment.id, updated_at: trx.fn.now() });
    const fresh = [input.coder1Id, input.coder2Id].filter((coder) => !claimed.some((c) => c.coder_id === coder));
    const created = fresh.length
      ? await trx('extractions')
          .insert(fresh.map((coder) => ({ reference_id: input.referenceId, assignment_id: assignment.id, kind: 'coding', coder_id: coder, state: 'draft', updated_by: actorId })))
          .returning(['id', 'coder_id'])
      : [];
    const rows = [...claimed, ...created];
    await recordAudit(trx, { actorId, action: 'assignment.create', entityType: 'assignment', entityId: assignment.id, details: input });
    return { assignment, extractions: rows as { id: number; coder_id: number }[], ref, coders };
  });
  const mails: OutgoingMail[] = result.coders.map((c: any) => {
    const ex = result.extractions.find((e) => e.coder_id === c.id)!;
    return {
      kind: 'assignment',
      to: c.email,
      subject: `Chronometa: please code ${refLabel(result.ref)}`,
      body: `Hello ${c.login},\n\nYou have been asked to code "${result.ref.title}" (${refLabel(result.ref)}) for the registry. A second coder codes it independently; you will not see each other's sheet until it is settled.\n\nOpen your sheet: ${ctx.env.APP_ORIGIN}/extractions/${ex.id}\n`,
    };
  });
  await queueMails(ctx, mails);
  return { id: result.assignment.id as number, extractionIds: result.extractions.map((e) => e.id) };
}

export async function listAssignments(db: Knex, q: { state?: string; page: number; pageSize: number; sort: 'id' | 'updated' | 'reference'; order: 'asc' | 'desc' }) {
  const base = db('assignments as a').join('refs as r', 'r.id', 'a.reference_id').modify((qb) => {
    if (q.state) qb.where('a.state', q.state);
  });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const sort = { id: 'a.id', updated: 'a.updated_at', reference: 'r.first_author' }[q.sort];
  const rows = await base
    .clone()
    .join('users as u1', 'u1.id', 'a.coder1_id')
    .join('users as u2', 'u2.id', 'a.coder2_id')
    .select('a.*', 'r.title', 'r.first_author', 'r.year', 'u1.login as coder1', 'u2.login as coder2')
    .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id and d.status = 'open') as open_discrepancies`))
    .select(db.raw(`(select count(*)::int from extractions x where x.assignment_id = a.id and x.kind = 'coding' and x.state <> 'draft') as submitted`))
    .orderBy(sort, q.order)
    .orderBy('a.id', 'asc')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return {
    total: Number(count),
    items: rows.map((r: any) => ({
      id: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, state: r.state,
      coder1: r.coder1, coder2: r.coder2, submitted: r.submitted, openDiscrepancies: r.open_discrepancies,
      createdAt: r.created_at, updatedAt: r.updated_at,
    })),
  };
}

/** Included references with their coding status, for a curator choosing what to assign. */
export async function listCandidates(db: Knex, q: { q?: string; status?: 'unassigned' | 'any'; page: number; pageSize: number; sort: 'reference' | 'year' | 'id'; order: 'asc' | 'desc' }) {
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
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const sort = { reference: 'r.first_author', year: 'r.year', id: 'r.id' }[q.sort];
  const rows = await base
    .clone()
    .select('r.id', 'r.title', 'r.first_author', 'r.year', 'r.doi')
    .select(db.raw(`(select a.state from assignments a where a.reference_id = r.id order by a.id desc limit 1) as assignment_state`))
    .select(db.raw(`exists(select 1 from extractions x where x.reference_id = r.id and x.kind = 'settled' and x.state = 'settled' and x.superseded_by is null) as settled`))
    .orderBy(sort, q.order)
    .orderBy('r.id', 'asc')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return {
    total: Number(count),
    items: rows.map((r: any) => ({ id: r.id, title: r.title, referenceLabel: refLabel(r), year: r.year, doi: r.doi, assignmentState: r.assignment_state, settled: r.settled })),
  };
}

/** Included references a contributor may claim: not being double coded, not settled, not already claimed by them. */
export async function listClaimable(db: Knex, userId: number, q: { q?: string; page: number; pageSize: number; sort: 'reference' | 'year'; order: 'asc' | 'desc' }) {
  const base = db('refs as r')
    .whereNull('r.merged_into')
    .where('r.screening_status', 'included')
    .whereNotExists(db('assignments as a').whereRaw('a.reference_id = r.id').whereIn('a.state', ['coding', 'disputed']))
    .whereNotExists(db('extractions as x').whereRaw('x.reference_id = r.id').where('x.kind', 'settled').whereNull('x.superseded_by').whereIn('x.state', ['settled', 'draft']))
    .whereNotExists(db('extractions as m').whereRaw('m.reference_id = r.id').where({ 'm.kind': 'coding', 'm.coder_id': userId }).whereNot('m.state', 'settled'))
    .modify((qb) => {
      if (q.q) qb.where((w) => w.whereILike('r.title', `%${q.q}%`).orWhereILike('r.first_author', `%${q.q}%`));
    });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const rows = await base
    .clone()
    .select('r.id', 'r.title', 'r.first_author', 'r.year', 'r.doi')
    .orderBy(q.sort === 'year' ? 'r.year' : 'r.first_author', q.order)
    .orderBy('r.id', 'asc')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return { total: Number(count), items: rows.map((r: any) => ({ id: r.id, title: r.title, referenceLabel: refLabel(r), year: r.year, doi: r.doi })) };
}

/** A contributor claims a reference to code it; a curator later pairs the claim with a second coder. */
export async function claimReference(db: Knex, actorId: number, referenceId: number) {
  return db.transaction(async (trx) => {
    const ref = await trx('refs').where({ id: referenceId }).forUpdate().first();
    if (!ref) throw new NotFoundError(`No reference ${referenceId}.`);
    if (ref.merged_into) throw new UnprocessableError(`Reference ${referenceId} was merged into ${ref.merged_into}; claim that one.`);
    if (ref.screening_status !== 'included') throw new UnprocessableError('Only included references are coded; screen it in first.');
    const active = await trx('assignments').where({ reference_id: referenceId }).whereIn('state', ['coding', 'disputed']).first('id');
    if (active) throw new ConflictError(`Reference ${referenceId} is already being double coded (assignment ${active.id}).`);
    const mine = await trx('extractions').where({ reference_id: referenceId, kind: 'coding', coder_id: actorId }).whereNot('state', 'settled').first('id');
    if (mine) throw new ConflictError(`You already have a sheet for this reference (extraction ${mine.id}).`, { extractionId: mine.id });
    const [x] = await trx('extractions').insert({ reference_id: referenceId, kind: 'coding', coder_id: actorId, state: 'draft', updated_by: actorId }).returning('id');
    await recordAudit(trx, { actorId, action: 'extraction.claim', entityType: 'extraction', entityId: x.id, details: { referenceId } });
    return { id: x.id as number };
  });
}

export async function listCoders(db: Knex) {
  const rows = await db('users as u')
    .join('user_roles as r', 'r.user_id', 'u.id')
    .whereIn('r.role', ['contributor', 'curator'])
    .distinct('u.id', 'u.login', 'u.name')
    .orderBy('u.login');
  return rows.map((r: any) => ({ id: r.id, login: r.login, name: r.name }));
}

// ---------------------------------------------------------------- extractions

export async function listMyExtractions(db: Knex, userId: number, q: { state?: string; page: number; pageSize: number; sort: 'updated' | 'reference' | 'state'; order: 'asc' | 'desc' }) {
  const base = db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .where({ 'x.coder_id': userId, 'x.kind': 'coding' })
    .modify((qb) => {
      if (q.state) qb.where('x.state', q.state);
    });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const sort = { updated: 'x.updated_at', reference: 'r.first_author', state: 'x.state' }[q.sort];
  const rows = await base
    .clone()
    .select('x.id', 'x.state', 'x.version', 'x.updated_at', 'x.assignment_id', 'x.reference_id', 'r.title', 'r.first_author', 'r.year')
    .select(db.raw(`(select count(*)::int from effects f where f.extraction_id = x.id) as effects`))
    .orderBy(sort, q.order)
    .orderBy('x.id', 'asc')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return {
    total: Number(count),
    items: rows.map((r: any) => ({
      id: r.id, state: r.state, version: r.version, updatedAt: r.updated_at, assignmentId: r.assignment_id,
      referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, effects: r.effects,
    })),
  };
}

/**
 * Who may read an extraction: its coder; for a settled record, anyone (drafts of a reopened record:
 * curators). Blind coding: while a pair is not settled, only a curator outside the pair may read a
 * coder's sheet — the other coder is refused.
 */
async function assertCanRead(db: Knex | Knex.Transaction, actor: Actor | null, x: any) {
  if (x.kind === 'settled') {
    if (x.state === 'draft' && !(actor && hasRole(actor.roles, 'curator'))) throw new ForbiddenError('A reopened record is visible to curators until it is settled again.');
    return;
  }
  if (!actor) throw new ForbiddenError('Sign in to see coding sheets.');
  if (x.coder_id === actor.id) return;
  const a = x.assignment_id ? await db('assignments').where({ id: x.assignment_id }).first() : null;
  const settled = a?.state === 'settled' || x.state === 'settled';
  const inPair = a && (a.coder1_id === actor.id || a.coder2_id === actor.id);
  if (inPair && !settled) throw new ForbiddenError('Coding is blind: you can see the other coder’s sheet once the pair is settled.');
  if (settled && hasRole(actor.roles, 'contributor')) return;
  if (hasRole(actor.roles, 'curator')) return;
  throw new ForbiddenError('Only its coder and curators can see this coding sheet.');
}

export async function getExtraction(db: Knex, actor: Actor | null, id: number) {
  const x = await db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .leftJoin('users as c', 'c.id', 'x.coder_id')
    .leftJoin('users as u', 'u.id', 'x.updated_by')
    .where('x.id', id)
    .first('x.*', 'r.title', 'r.first_author', 'r.year', 'r.doi', 'c.login as coder_login', 'u.login as updated_by_login');
  if (!x) throw new NotFoundError(`No extraction ${id}.`);
  await assertCanRead(db, actor, x);
  const studies = await readSheet(db, id);
  const editable =
    !!actor && x.state === 'draft' && ((x.kind === 'coding' && x.coder_id === actor.id) || (x.kind === 'settled' && hasRole(actor.roles, 'curator')));
  return {
    extraction: {
      id: x.id, kind: x.kind, state: x.state, version: x.version, recordVersion: x.record_version, assignmentId: x.assignment_id,
      referenceId: x.reference_id, reference: { id: x.reference_id, title: x.title, label: refLabel(x), doi: x.doi, year: x.year },
      coder: x.coder_login, updatedBy: x.updated_by_login, updatedAt: x.updated_at, submittedAt: x.submitted_at, settledAt: x.settled_at,
      supersedesId: x.supersedes_id, supersededBy: x.superseded_by, reopenReason: x.reopen_reason, notes: x.notes, editable,
    },
    studies,
  };
}

async function lockEditable(trx: Knex.Transaction, actor: Actor, id: number, version: number) {
  const x = await trx('extractions').where({ id }).forUpdate().first();
  if (!x) throw new NotFoundError(`No extraction ${id}.`);
  const mine = x.kind === 'coding' ? x.coder_id === actor.id : hasRole(actor.roles, 'curator');
  if (!mine) throw new ForbiddenError(x.kind === 'coding' ? 'Only its coder can edit a coding sheet.' : 'Only curators edit a reopened record.');
  if (x.state !== 'draft') throw new ConflictError(`This sheet is ${x.state} and can no longer be edited.`);
  if (x.version !== version) throw await staleEdit(trx, 'This sheet', x);
  return x;
}

/** Saves a draft (also the autosave); the server recomputes every effect. */
export async function saveDraft(db: Knex, actor: Actor, id: number, input: { version: number; sheet: Sheet }) {
  return db.transaction(async (trx) => {
    const x = await lockEditable(trx, actor, id, input.version);
    const studyIds = x.kind === 'settled' ? (await trx('extraction_studies').where({ extraction_id: id }).orderBy('position').pluck('study_id')) : undefined;
    // A reopened record keeps its studies' identities by position; new studies get new ones.
    let ids: (number | null)[] | undefined = studyIds;
    if (x.kind === 'settled') {
      ids = [];
      for (let i = 0; i < input.sheet.studies.length; i++) {
        const existing = studyIds?.[i];
        ids.push(existing ?? (await trx('studies').insert({ reference_id: x.reference_id }).returning('id'))[0].id);
      }
    }
    await writeSheet(trx, id, input.sheet, { studyIds: ids, actorId: actor.id });
    const [row] = await trx('extractions')
      .where({ id })
      .update({ version: x.version + 1, notes: input.sheet.notes ?? '', updated_by: actor.id, updated_at: trx.fn.now() })
      .returning(['version', 'updated_at']);
    await recordAudit(trx, {
      actorId: actor.id, action: 'extraction.save', entityType: 'extraction', entityId: id,
      details: { version: row.version, studies: input.sheet.studies.length, effects: input.sheet.studies.reduce((n, s) => n + s.effects.length, 0) },
    });
    return { version: row.version as number, updatedAt: row.updated_at, studies: await readSheet(trx, id) };
  });
}

/**
 * Submits a coder's sheet. When it is the second of its pair to arrive, the two are compared: matched
 * pairs settle at once, disputed ones go to the reconciliation queue with their discrepancies.
 */
export async function submitExtraction(ctx: AppContext, actor: Actor, id: number, input: { version: number }) {
  const mails: OutgoingMail[] = [];
  const result = await ctx.db.transaction(async (trx) => {
    const peek = await trx('extractions').where({ id }).first('assignment_id', 'kind');
    if (!peek) throw new NotFoundError(`No extraction ${id}.`);
    if (peek.kind !== 'coding') throw new UnprocessableError('A reopened record is settled, not submitted.');
    // Lock the pair first so two coders submitting at once are compared exactly once.
    const assignment = peek.assignment_id ? await trx('assignments').where({ id: peek.assignment_id }).forUpdate().first() : null;
    const x = await lockEditable(trx, actor, id, input.version);
    const sheet = parseCompleteSheet(toSheet(await readSheet(trx, id), x.notes));
    await trx('extractions').where({ id }).update({ state: 'submitted', submitted_at: trx.fn.now(), version: x.version + 1, updated_by: actor.id, updated_at: trx.fn.now() });
    await recordAudit(trx, { actorId: actor.id, action: 'extraction.submit', entityType: 'extraction', entityId: id, details: { assignmentId: assignment?.id ?? null } });
    if (!assignment) return { state: 'submitted', pairState: null, discrepancies: 0 };
    const other = await trx('extractions').where({ assignment_id: assignment.id, kind: 'coding' }).whereNot({ id }).first();
    if (!other || other.state !== 'submitted') return { state: 'submitted', pairState: assignment.state, discrepancies: 0 };

    const first = assignment.coder1_id === x.coder_id ? sheet : toSheet(await readSheet(trx, other.id), other.notes);
    const second = assignment.coder1_id === x.coder_id ? toSheet(await readSheet(trx, other.id), other.notes) : sheet;
    const found = compareSheets(first, second);
    const ref = await trx('refs').where({ id: assignment.reference_id }).first();
    const coders = await emailsOf(trx, [assignment.coder1_id, assignment.coder2_id]);
    if (found.length === 0) {
      const settled = await createSettledRecord(trx, {
        referenceId: assignment.reference_id, sheet: first, actorId: null, kind: 'matched', assignmentId: assignment.id,
        rationale: 'Both coders agreed on every compared field.',
      });
      await trx('extractions').where({ assignment_id: assignment.id, kind: 'coding' }).update({ state: 'settled', settled_at: trx.fn.now(), updated_at: trx.fn.now() });
      await trx('assignments').where({ id: assignment.id }).update({ state: 'settled', version: assignment.version + 1, updated_at: trx.fn.now() });
      await recordAudit(trx, { actorId: null, action: 'assignment.matched', entityType: 'assignment', entityId: assignment.id, details: { recordId: settled.recordId } });
      for (const c of coders.values()) mails.push(settledMail(ctx, c, ref, settled.recordId, 'Both codings agreed, so the record was settled automatically.'));
      return { state: 'settled', pairState: 'settled', discrepancies: 0, recordId: settled.recordId };
    }
    await trx('discrepancies').insert(
      found.map((d) => ({ assignment_id: assignment.id, path: d.path, field: d.field, label: d.label, value_a: JSON.stringify(d.valueA), value_b: JSON.stringify(d.valueB) })),
    );
    await trx('extractions').where({ assignment_id: assignment.id, kind: 'coding' }).update({ state: 'disputed', updated_at: trx.fn.now() });
    await trx('assignments').where({ id: assignment.id }).update({ state: 'disputed', version: assignment.version + 1, updated_at: trx.fn.now() });
    await recordAudit(trx, { actorId: null, action: 'assignment.disputed', entityType: 'assignment', entityId: assignment.id, details: { discrepancies: found.length } });
    for (const to of await curatorEmails(trx)) {
      mails.push({
        kind: 'disputed',
        to,
        subject: `Chronometa: ${refLabel(ref)} needs reconciliation (${found.length} discrepanc${found.length === 1 ? 'y' : 'ies'})`,
        body: `The two codings of "${ref.title}" (${refLabel(ref)}) disagree on ${found.length} field${found.length === 1 ? '' : 's'}:\n\n${found.map((d) => `- ${d.label}`).join('\n')}\n\nReconcile them: ${ctx.env.APP_ORIGIN}/reconciliation/${assignment.id}\n`,
      });
    }
    return { state: 'disputed', pairState: 'disputed', discrepancies: found.length };
  });
  await queueMails(ctx, mails);
  return result;
}

function settledMail(ctx: AppContext, c: { email: string | null; login: string }, ref: any, recordId: number, how: string): OutgoingMail {
  return {
    kind: 'settled',
    to: c.email ?? '',
    subject: `Chronometa: your coding of ${refLabel(ref)} is settled`,
    body: `Hello ${c.login},\n\nThe record of "${ref.title}" (${refLabel(ref)}) is settled. ${how}\n\nSee the settled record: ${ctx.env.APP_ORIGIN}/records/${recordId}\n`,
  };
}

// ---------------------------------------------------------------- reconciliation

export async function listQueue(db: Knex, q: { page: number; pageSize: number; sort: 'updated' | 'reference' | 'open'; order: 'asc' | 'desc' }) {
  const base = db('assignments as a').join('refs as r', 'r.id', 'a.reference_id').where('a.state', 'disputed');
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const sort = { updated: 'a.updated_at', reference: 'r.first_author', open: db.raw('open_discrepancies') }[q.sort];
  const rows = await base
    .clone()
    .join('users as u1', 'u1.id', 'a.coder1_id')
    .join('users as u2', 'u2.id', 'a.coder2_id')
    .select('a.id', 'a.reference_id', 'a.updated_at', 'r.title', 'r.first_author', 'r.year', 'u1.login as coder1', 'u2.login as coder2')
    .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id and d.status = 'open') as open_discrepancies`))
    .select(db.raw(`(select count(*)::int from discrepancies d where d.assignment_id = a.id) as discrepancies`))
    .orderBy(sort as any, q.order)
    .orderBy('a.id', 'asc')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  const reopened = await db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .where({ 'x.kind': 'settled', 'x.state': 'draft' })
    .orderBy('x.updated_at', 'desc')
    .limit(50)
    .select('x.id', 'x.reference_id', 'x.record_version', 'x.reopen_reason', 'x.updated_at', 'r.title', 'r.first_author', 'r.year');
  return {
    total: Number(count),
    items: rows.map((r: any) => ({
      assignmentId: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, coder1: r.coder1, coder2: r.coder2,
      openDiscrepancies: r.open_discrepancies, discrepancies: r.discrepancies, updatedAt: r.updated_at,
    })),
    reopened: reopened.map((r: any) => ({
      recordId: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, recordVersion: r.record_version, reason: r.reopen_reason, updatedAt: r.updated_at,
    })),
  };
}

export async function getPair(db: Knex, assignmentId: number) {
  const a = await db('assignments as a')
    .join('refs as r', 'r.id', 'a.reference_id')
    .join('users as u1', 'u1.id', 'a.coder1_id')
    .join('users as u2', 'u2.id', 'a.coder2_id')
    .where('a.id', assignmentId)
    .first('a.*', 'r.title', 'r.first_author', 'r.year', 'r.doi', 'u1.login as coder1', 'u2.login as coder2');
  if (!a) throw new NotFoundError(`No assignment ${assignmentId}.`);
  const xs = await db('extractions').where({ assignment_id: assignmentId, kind: 'coding' });
  const xa = xs.find((x: any) => x.coder_id === a.coder1_id);
  const xb = xs.find((x: any) => x.coder_id === a.coder2_id);
  const discrepancies = await db('discrepancies as d').leftJoin('users as u', 'u.id', 'd.resolved_by').where('d.assignment_id', assignmentId).orderBy('d.id').select('d.*', 'u.login as resolved_by_login');
  const settlement = await db('settlements').where({ assignment_id: assignmentId }).orderBy('id', 'desc').first();
  return {
    assignment: {
      id: a.id, state: a.state, version: a.version, referenceId: a.reference_id,
      reference: { id: a.reference_id, title: a.title, label: refLabel(a), doi: a.doi },
      coder1: a.coder1, coder2: a.coder2, recordId: settlement?.record_id ?? null,
    },
    a: xa ? { extractionId: xa.id, coder: a.coder1, state: xa.state, studies: xa.state === 'draft' ? [] : await readSheet(db, xa.id) } : null,
    b: xb ? { extractionId: xb.id, coder: a.coder2, state: xb.state, studies: xb.state === 'draft' ? [] : await readSheet(db, xb.id) } : null,
    discrepancies: discrepancies.map((d: any) => ({
      id: d.id, path: d.path, field: d.field, label: d.label, valueA: d.value_a, valueB: d.value_b, status: d.status,
      resolution: d.resolution, resolvedValue: d.resolved_value, rationale: d.rationale, resolvedBy: d.resolved_by_login, resolvedAt: d.resolved_at,
    })),
  };
}

const STUDY_FIELDS = new Set(['design', 'population', 'diagnosis', 'modality', 'task', 'n1', 'n2', 'standardMs']);

/** Checks a curator's own value for a field has the field's type and vocabulary. */
function checkValue(field: string, value: unknown): unknown {
  const fail = (message: string) => new ValidationError(`value: ${message}`, [{ path: 'body.value', message }]);
  if (field === 'studies' || field === 'effects') throw new UnprocessableError('A count is settled by taking one coder’s list (a or b), not by entering a value.');
  if (STUDY_FIELDS.has(field)) {
    const r = (studyDraftSchema.shape as any)[field].safeParse(value);
    if (!r.success) throw fail(r.error.issues[0].message);
    return r.data ?? null;
  }
  if (field === 'outcome' || field === 'manipulation') {
    const r = (effectDraftSchema.shape as any)[field].safeParse(value);
    if (!r.success || r.data === undefined) throw fail(r.success ? 'enter a value' : r.error.issues[0].message);
    return r.data;
  }
  if (field === 'effect') {
    const r = effectDraftSchema.pick({ form: true, reported: true, assumedR: true }).safeParse(value);
    if (!r.success) throw fail(r.error.issues[0].message);
    if (!r.data.form) throw fail('choose how the result was reported');
    const c = tryComputeReported(r.data.form, r.data.reported as Reported, r.data.assumedR ?? null);
    if (!c.ok) throw new ValidationError(`value.reported: ${c.error}`, [{ path: `body.value.reported${c.field ? `.${c.field}` : ''}`, message: c.error! }]);
    return { form: r.data.form, reported: r.data.reported, assumedR: r.data.assumedR ?? null, metric: c.result!.metric, effect: c.result!.effect, variance: c.result!.variance };
  }
  throw fail(`no field ${field}`);
}

export async function resolveDiscrepancy(db: Knex, actorId: number, assignmentId: number, discrepancyId: number, input: { resolution: 'a' | 'b' | 'value'; value?: unknown; rationale: string }) {
  return db.transaction(async (trx) => {
    const a = await trx('assignments').where({ id: assignmentId }).forUpdate().first();
    if (!a) throw new NotFoundError(`No assignment ${assignmentId}.`);
    if (a.state !== 'disputed') throw new ConflictError(`This pair is ${a.state}; only disputed pairs are reconciled.`);
    const d = await trx('discrepancies').where({ id: discrepancyId, assignment_id: assignmentId }).first();
    if (!d) throw new NotFoundError(`No discrepancy ${discrepancyId} in assignment ${assignmentId}.`);
    if (input.resolution === 'value' && d.field === 'manipulation') await resolveManipulations(trx, [String(input.value)]);
    const value = input.resolution === 'a' ? d.value_a : input.resolution === 'b' ? d.value_b : checkValue(d.field, input.value);
    const [row] = await trx('discrepancies')
      .where({ id: d.id })
      .update({ status: 'resolved', resolution: input.resolution, resolved_value: JSON.stringify(value ?? null), rationale: input.rationale, resolved_by: actorId, resolved_at: trx.fn.now() })
      .returning('*');
    await recordAudit(trx, { actorId, action: 'discrepancy.resolve', entityType: 'discrepancy', entityId: d.id, details: { assignmentId, path: d.path, resolution: input.resolution, value, rationale: input.rationale } });
    return { id: row.id, status: row.status, resolution: row.resolution, resolvedValue: row.resolved_value, rationale: row.rationale };
  });
}

export async function settlePair(ctx: AppContext, actorId: number, assignmentId: number, input: { rationale: string }) {
  const mails: OutgoingMail[] = [];
  const out = await ctx.db.transaction(async (trx) => {
    const a = await trx('assignments').where({ id: assignmentId }).forUpdate().first();
    if (!a) throw new NotFoundError(`No assignment ${assignmentId}.`);
    if (a.state !== 'disputed') throw new ConflictError(`This pair is ${a.state}; only disputed pairs are settled here.`);
    const ds = await trx('discrepancies').where({ assignment_id: assignmentId }).orderBy('id');
    const open = ds.filter((d: any) => d.status !== 'resolved');
    if (open.length) throw new UnprocessableError(`${open.length} discrepanc${open.length === 1 ? 'y is' : 'ies are'} still open: ${open.map((d: any) => d.label).join('; ')}.`, open.map((d: any) => ({ id: d.id, path: d.path })));
    const xs = await trx('extractions').where({ assignment_id: assignmentId, kind: 'coding' });
    const xa = xs.find((x: any) => x.coder_id === a.coder1_id);
    const xb = xs.find((x: any) => x.coder_id === a.coder2_id);
    const { mergeSheets } = await import('./comparison.js');
    const merged = mergeSheets(toSheet(await readSheet(trx, xa.id), xa.notes), toSheet(await readSheet(trx, xb.id), xb.notes), ds.map((d: any) => ({ path: d.path, field: d.field, value: d.resolved_value, structural: d.resolution === 'value' ? null : d.resolution })));
    const rationale = [input.rationale, ...ds.map((d: any) => `${d.label}: ${d.resolution === 'value' ? 'own value' : `coder ${d.resolution.toUpperCase()}`} — ${d.rationale}`)].filter(Boolean).join('\n');
    const settled = await createSettledRecord(trx, { referenceId: a.reference_id, sheet: merged, actorId, kind: 'reconciled', assignmentId, rationale });
    await trx('extractions').where({ assignment_id: assignmentId, kind: 'coding' }).update({ state: 'settled', settled_at: trx.fn.now(), updated_at: trx.fn.now() });
    await trx('assignments').where({ id: assignmentId }).update({ state: 'settled', version: a.version + 1, updated_at: trx.fn.now() });
    await recordAudit(trx, { actorId, action: 'assignment.settle', entityType: 'assignment', entityId: assignmentId, details: { recordId: settled.recordId, rationale: input.rationale } });
    const ref = await trx('refs').where({ id: a.reference_id }).first();
    for (const c of (await emailsOf(trx, [a.coder1_id, a.coder2_id])).values()) mails.push(settledMail(ctx, c, ref, settled.recordId, 'A curator reconciled the two codings.'));
    return settled;
  });
  await queueMails(ctx, mails);
  return out;
}

// ---------------------------------------------------------------- settled records

export async function listRecords(db: Knex, referenceId: number) {
  const rows = await db('extractions as x')
    .leftJoin('users as u', 'u.id', 'x.updated_by')
    .where({ 'x.reference_id': referenceId, 'x.kind': 'settled' })
    .orderBy('x.record_version', 'desc')
    .select('x.id', 'x.state', 'x.record_version', 'x.superseded_by', 'x.reopen_reason', 'x.settled_at', 'x.created_at', 'u.login as updated_by');
  const settlements = await db('settlements as s').leftJoin('users as u', 'u.id', 's.actor_id').where('s.reference_id', referenceId).orderBy('s.id', 'desc').select('s.*', 'u.login');
  return {
    records: rows.map((r: any) => ({ id: r.id, state: r.state, recordVersion: r.record_version, current: r.superseded_by == null, supersededBy: r.superseded_by, reopenReason: r.reopen_reason, settledAt: r.settled_at, createdAt: r.created_at, updatedBy: r.updated_by })),
    settlements: settlements.map((s: any) => ({ id: s.id, recordId: s.record_id, kind: s.kind, by: s.login, rationale: s.rationale, at: s.at })),
  };
}

async function lockCurrentSettled(trx: Knex.Transaction, recordId: number) {
  const x = await trx('extractions').where({ id: recordId }).forUpdate().first();
  if (!x || x.kind !== 'settled') throw new NotFoundError(`No settled record ${recordId}.`);
  if (x.superseded_by) throw new ConflictError(`Record ${recordId} is an old version (superseded by ${x.superseded_by}).`);
  return x;
}

/** Reopens a settled record: a new draft version (curators edit, then settle it) replaces it in analyses; the old is kept. */
export async function reopenRecord(db: Knex, actorId: number, recordId: number, reason: string) {
  return db.transaction(async (trx) => {
    const x = await lockCurrentSettled(trx, recordId);
    if (x.state !== 'settled') throw new ConflictError(`Record ${recordId} is ${x.state}; only a settled record can be reopened.`);
    const [draft] = await trx('extractions')
      .insert({
        reference_id: x.reference_id, assignment_id: x.assignment_id, kind: 'settled', coder_id: null, state: 'draft',
        record_version: x.record_version + 1, supersedes_id: x.id, reopen_reason: reason, notes: x.notes, updated_by: actorId,
      })
      .returning('*');
    // Withdrawn effects stay out of the new version.
    const studies = (await readSheet(trx, x.id)).map((s) => ({ ...s, effects: s.effects.filter((e) => !e.withdrawnReason) }));
    await writeSheet(trx, draft.id, toSheet(studies, x.notes), { studyIds: studies.map((s) => s.studyId), actorId });
    await trx('extractions').where({ id: x.id }).update({ superseded_by: draft.id, updated_at: trx.fn.now() });
    await trx('settlements').insert({ reference_id: x.reference_id, assignment_id: x.assignment_id, record_id: x.id, kind: 'reopened', actor_id: actorId, rationale: reason });
    await recordAudit(trx, { actorId, action: 'record.reopen', entityType: 'extraction', entityId: x.id, details: { reason, newVersionId: draft.id } });
    const registryVersion = await bumpRegistry(trx, { kind: 'reopen', referenceId: x.reference_id, extractionId: x.id, actorId, details: { reason } });
    return { recordId: draft.id as number, recordVersion: draft.record_version as number, registryVersion };
  });
}

/** Settles a reopened draft version (curators). */
export async function settleRecordDraft(ctx: AppContext, actorId: number, recordId: number, input: { rationale: string; version?: number }) {
  const mails: OutgoingMail[] = [];
  const out = await ctx.db.transaction(async (trx) => {
    const x = await lockCurrentSettled(trx, recordId);
    if (x.state !== 'draft') throw new ConflictError(`Record ${recordId} is ${x.state}, not a reopened draft.`);
    if (input.version !== undefined && input.version !== x.version) throw await staleEdit(trx, 'This record', x);
    parseCompleteSheet(toSheet(await readSheet(trx, recordId), x.notes));
    await trx('extractions').where({ id: recordId }).update({ state: 'settled', settled_at: trx.fn.now(), version: x.version + 1, updated_by: actorId, updated_at: trx.fn.now() });
    await trx('settlements').insert({ reference_id: x.reference_id, assignment_id: x.assignment_id, record_id: recordId, kind: 'reconciled', actor_id: actorId, rationale: input.rationale });
    await recordAudit(trx, { actorId, action: 'record.settle', entityType: 'extraction', entityId: recordId, details: { kind: 'reopened-version', recordVersion: x.record_version, rationale: input.rationale } });
    const registryVersion = await bumpRegistry(trx, { kind: 'settle.reopened', referenceId: x.reference_id, extractionId: recordId, actorId });
    if (x.assignment_id) {
      const a = await trx('assignments').where({ id: x.assignment_id }).first();
      const ref = await trx('refs').where({ id: x.reference_id }).first();
      for (const c of (await emailsOf(trx, [a.coder1_id, a.coder2_id])).values()) mails.push(settledMail(ctx, c, ref, recordId, `A curator settled version ${x.record_version} after reopening it (${x.reopen_reason}).`));
    }
    return { recordId, recordVersion: x.record_version as number, registryVersion };
  });
  await queueMails(ctx, mails);
  return out;
}

export async function withdrawRecord(db: Knex, actorId: number, recordId: number, reason: string) {
  return db.transaction(async (trx) => {
    const x = await lockCurrentSettled(trx, recordId);
    if (x.state === 'withdrawn') throw new ConflictError(`Record ${recordId} is already withdrawn.`);
    await trx('extractions').where({ id: recordId }).update({ state: 'withdrawn', version: x.version + 1, updated_by: actorId, updated_at: trx.fn.now() });
    await trx('settlements').insert({ reference_id: x.reference_id, assignment_id: x.assignment_id, record_id: recordId, kind: 'withdrawn', actor_id: actorId, rationale: reason });
    await recordAudit(trx, { actorId, action: 'record.withdraw', entityType: 'extraction', entityId: recordId, details: { reason } });
    const registryVersion = await bumpRegistry(trx, { kind: 'withdraw', referenceId: x.reference_id, extractionId: recordId, actorId, details: { reason } });
    return { recordId, state: 'withdrawn', registryVersion };
  });
}

/** A curator's correction of one settled effect: recomputed on the server, versioned, audited, and a registry change. */
export async function editSettledEffect(db: Knex, actorId: number, effectId: number, input: { version: number; reason: string; effect: ReturnType<typeof effectDraftSchema.parse> }) {
  return db.transaction(async (trx) => {
    const f = await trx('effects').where({ id: effectId }).forUpdate().first();
    if (!f) throw new NotFoundError(`No effect ${effectId}.`);
    const x = await trx('extractions').where({ id: f.extraction_id }).first();
    if (x.kind !== 'settled' || x.state !== 'settled' || x.superseded_by) throw new ConflictError(`Effect ${effectId} is not part of a current settled record.`);
    if (f.version !== input.version) throw await staleEdit(trx, `Effect ${effectId}`, f);
    const e = input.effect;
    const problems: { path: string; message: string }[] = [];
    if (!e.outcome) problems.push({ path: 'body.effect.outcome', message: 'choose an outcome kind' });
    if (!e.manipulation) problems.push({ path: 'body.effect.manipulation', message: 'choose a manipulation' });
    if (!e.form) problems.push({ path: 'body.effect.form', message: 'choose how the result was reported' });
    if (e.form && e.outcome && !OUTCOMES[e.outcome].metrics.includes(METRIC_OF_FORM[e.form]))
      problems.push({ path: 'body.effect.form', message: `${OUTCOMES[e.outcome].label} is not pooled as ${METRIC_LABELS[METRIC_OF_FORM[e.form]]}` });
    const c = e.form ? tryComputeReported(e.form, e.reported as Reported, e.assumedR ?? null) : null;
    if (c && !c.ok) problems.push({ path: `body.effect.reported${c.field ? `.${c.field}` : ''}`, message: c.error! });
    if (problems.length) throw new ValidationError(`${problems[0].path}: ${problems[0].message}`, problems);
    const ids = await resolveManipulations(trx, [e.manipulation!]);
    const before = { outcome: f.outcome, manipulationId: f.manipulation_id, form: f.report_form, reported: f.reported, effect: f.effect, variance: f.variance };
    const r = c!.result!;
    const [row] = await trx('effects')
      .where({ id: effectId })
      .update({
        label: e.label ?? f.label, outcome: e.outcome, manipulation_id: ids.get(e.manipulation!), report_form: e.form, reported: JSON.stringify(e.reported ?? {}),
        metric: r.metric, effect: r.effect, variance: r.variance, formula: r.formula, assumed_r: r.assumedR, n_total: r.n,
        page: e.page ?? f.page, locator: e.locator ?? f.locator, quote: e.quote ?? f.quote,
        version: f.version + 1, updated_by: actorId, updated_at: trx.fn.now(),
      })
      .returning('*');
    await trx('settlements').insert({ reference_id: x.reference_id, assignment_id: x.assignment_id, record_id: x.id, kind: 'edited', actor_id: actorId, rationale: input.reason });
    await recordAudit(trx, { actorId, action: 'effect.edit', entityType: 'effect', entityId: effectId, details: { reason: input.reason, before, after: { effect: r.effect, variance: r.variance, form: e.form } } });
    const registryVersion = await bumpRegistry(trx, { kind: 'effect.edit', referenceId: x.reference_id, extractionId: x.id, effectId, actorId, details: { reason: input.reason } });
    return { id: row.id as number, version: row.version as number, effect: r.effect, variance: r.variance, metric: r.metric, formula: r.formula, registryVersion };
  });
}

/** Withdraws one settled effect (it leaves every analysis; the row and its history stay). */
export async function withdrawEffect(db: Knex, actorId: number, effectId: number, reason: string) {
  return db.transaction(async (trx) => {
    const f = await trx('effects').where({ id: effectId }).forUpdate().first();
    if (!f) throw new NotFoundError(`No effect ${effectId}.`);
    const x = await trx('extractions').where({ id: f.extraction_id }).first();
    if (x.kind !== 'settled' || x.state !== 'settled' || x.superseded_by) throw new ConflictError(`Effect ${effectId} is not part of a current settled record.`);
    if (f.withdrawn_at) throw new ConflictError(`Effect ${effectId} is already withdrawn.`);
    await trx('effects').where({ id: effectId }).update({ withdrawn_at: trx.fn.now(), withdrawn_reason: reason, version: f.version + 1, updated_by: actorId, updated_at: trx.fn.now() });
    await trx('settlements').insert({ reference_id: x.reference_id, assignment_id: x.assignment_id, record_id: x.id, kind: 'withdrawn', actor_id: actorId, rationale: `effect ${effectId}: ${reason}` });
    await recordAudit(trx, { actorId, action: 'effect.withdraw', entityType: 'effect', entityId: effectId, details: { reason } });
    const registryVersion = await bumpRegistry(trx, { kind: 'effect.withdraw', referenceId: x.reference_id, extractionId: x.id, effectId, actorId, details: { reason } });
    return { id: effectId, withdrawn: true, registryVersion };
  });
}
