import type { Knex } from 'knex';
import { sheetDraftSchema, sheetSubmitSchema, type Sheet, type SheetInput } from '../../shared/schemas/extraction.js';
import { ValidationError } from '../lib/errors.js';
import { parseInput } from '../lib/validate.js';
import { bumpRegistry } from '../db/registry-version.js';
import { readSheet, writeSheet } from '../db/sheets-repo.js';
import { recordAudit } from './audit.js';

export type SettlementKind = 'matched' | 'reconciled' | 'direct' | 'reopened' | 'withdrawn' | 'edited';

/** Checks a sheet is complete (every effect computes); throws a 400 with a path per problem. */
export function parseCompleteSheet(sheet: unknown, where = 'sheet'): Sheet {
  return parseInput(sheetSubmitSchema, sheet, where);
}

/** The current settled record of a reference (not superseded), or undefined. */
export async function currentRecord(db: Knex | Knex.Transaction, referenceId: number) {
  return db('extractions')
    .where({ reference_id: referenceId, kind: 'settled' })
    .whereNull('superseded_by')
    .orderBy('record_version', 'desc')
    .first();
}

/** Stable study ids for a new record version: reuse the previous version's by position, create the rest. */
async function studyIdsFor(trx: Knex.Transaction, referenceId: number, count: number, previousId: number | null): Promise<number[]> {
  const previous: { position: number; study_id: number | null }[] = previousId
    ? await trx('extraction_studies').where({ extraction_id: previousId }).orderBy('position').select('position', 'study_id')
    : [];
  const ids: number[] = [];
  for (let i = 0; i < count; i++) {
    const prev = previous.find((p) => p.position === i + 1)?.study_id;
    if (prev) ids.push(prev);
    else {
      const [row] = await trx('studies').insert({ reference_id: referenceId }).returning('id');
      ids.push(row.id);
    }
  }
  return ids;
}

export interface SettledRecordInput {
  referenceId: number;
  sheet: SheetInput | Sheet;
  actorId?: number | null;
  kind?: SettlementKind;
  rationale?: string;
  assignmentId?: number | null;
}

/**
 * Creates the settled record of a reference from a complete sheet, in the caller's transaction: a new
 * record version (the previous current one is superseded and kept), stable study ids by position,
 * a settlement row, an audit entry and a registry change. Also the helper for tests and seeds that need
 * settled effects without driving the double-coding flow.
 * Example: await db.transaction((trx) => createSettledRecord(trx, { referenceId, sheet: { studies: [...] } }))
 */
export async function createSettledRecord(trx: Knex.Transaction, input: SettledRecordInput) {
  const sheet = parseCompleteSheet(sheetDraftSchema.parse(input.sheet));
  const ref = await trx('refs').where({ id: input.referenceId }).first('id');
  if (!ref) throw new ValidationError(`No reference ${input.referenceId}.`, [{ path: 'referenceId', message: 'no such reference' }]);
  const previous = await currentRecord(trx, input.referenceId);
  const [record] = await trx('extractions')
    .insert({
      reference_id: input.referenceId,
      assignment_id: input.assignmentId ?? null,
      kind: 'settled',
      coder_id: null,
      state: 'settled',
      record_version: (previous?.record_version ?? 0) + 1,
      supersedes_id: previous?.id ?? null,
      notes: sheet.notes ?? '',
      updated_by: input.actorId ?? null,
      settled_at: trx.fn.now(),
      submitted_at: trx.fn.now(),
    })
    .returning('*');
  if (previous) await trx('extractions').where({ id: previous.id }).update({ superseded_by: record.id, updated_at: trx.fn.now() });
  const studyIds = await studyIdsFor(trx, input.referenceId, sheet.studies.length, previous?.id ?? null);
  await writeSheet(trx, record.id, sheet, { studyIds, actorId: input.actorId ?? null });
  const kind = input.kind ?? 'direct';
  await trx('settlements').insert({
    reference_id: input.referenceId,
    assignment_id: input.assignmentId ?? null,
    record_id: record.id,
    kind,
    actor_id: input.actorId ?? null,
    rationale: input.rationale ?? '',
  });
  await recordAudit(trx, {
    actorId: input.actorId ?? null,
    action: 'record.settle',
    entityType: 'extraction',
    entityId: record.id,
    details: { referenceId: input.referenceId, kind, recordVersion: record.record_version, assignmentId: input.assignmentId ?? null },
  });
  const registryVersion = await bumpRegistry(trx, { kind: `settle.${kind}`, referenceId: input.referenceId, extractionId: record.id, actorId: input.actorId ?? null });
  const studies = await readSheet(trx, record.id);
  return {
    recordId: record.id as number,
    recordVersion: record.record_version as number,
    registryVersion,
    studyIds: studyIds,
    effectIds: studies.flatMap((s) => s.effects.map((e) => e.id)),
  };
}
