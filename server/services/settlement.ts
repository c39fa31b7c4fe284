import type { Knex } from 'knex';
import { sheetDraftSchema, sheetSubmitSchema, type Sheet, type SheetInput } from '../../shared/schemas/extraction.js';
import { ValidationError } from '../lib/errors.js';
import { parseInput } from '../lib/validate.js';
import { recordAudit } from '../repositories/audit.js';
import { currentRecord, insertExtraction, insertSettlement, newStudy, readSheet, sheetTerms, studyIdsOf, updateExtraction, writeSheet } from '../repositories/extractions.js';
import { findRef } from '../repositories/refs.js';
import { bumpRegistry } from '../repositories/registry-version.js';
import type { SettlementKind } from '../repositories/rows.js';
import { resolveManipulations } from './manipulations.js';
import { assertQuantities, sheetEffects } from './quantities.js';

export type { SettlementKind };
export { currentRecord };

/** Checks a sheet is complete (every effect computes); throws a 400 with a path per problem. */
export function parseCompleteSheet(sheet: unknown, where = 'sheet'): Sheet {
  return parseInput(sheetSubmitSchema, sheet, where);
}

/** Writes a sheet into an extraction, resolving its manipulation terms first (an unknown term is a 400). */
export async function saveSheet(trx: Knex.Transaction, extractionId: number, sheet: Sheet, opts: { studyIds?: (number | null)[]; actorId?: number | null } = {}) {
  assertQuantities(sheetEffects(sheet), 'body.sheet.');
  const termIds = await resolveManipulations(trx, sheetTerms(sheet));
  await writeSheet(trx, extractionId, sheet, { ...opts, termIds });
}

/**
 * Stable study ids for `count` studies by position: the given ones where there are some (a previous version's, or
 * the draft's own), new identities for the rest.
 */
export async function stableStudyIds(trx: Knex.Transaction, referenceId: number, count: number, existing: (number | null)[]): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < count; i++) ids.push(existing[i] ?? (await newStudy(trx, referenceId)));
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
  if (!(await findRef(trx, input.referenceId))) throw new ValidationError(`No reference ${input.referenceId}.`, [{ path: 'referenceId', message: 'no such reference' }]);
  const previous = await currentRecord(trx, input.referenceId);
  const record = await insertExtraction(trx, {
    reference_id: input.referenceId,
    assignment_id: input.assignmentId ?? null,
    kind: 'settled',
    coder_id: null,
    state: 'settled',
    record_version: (previous?.record_version ?? 0) + 1,
    supersedes_id: previous?.id ?? null,
    notes: sheet.notes ?? '',
    updated_by: input.actorId ?? null,
    settledNow: true,
  });
  if (previous) await updateExtraction(trx, previous.id, { superseded_by: record.id });
  const studyIds = await stableStudyIds(trx, input.referenceId, sheet.studies.length, previous ? await studyIdsOf(trx, previous.id) : []);
  await saveSheet(trx, record.id, sheet, { studyIds, actorId: input.actorId ?? null });
  const kind = input.kind ?? 'direct';
  await insertSettlement(trx, { referenceId: input.referenceId, assignmentId: input.assignmentId ?? null, recordId: record.id, kind, actorId: input.actorId ?? null, rationale: input.rationale ?? '' });
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
    recordId: record.id,
    recordVersion: record.record_version!,
    registryVersion,
    studyIds,
    effectIds: studies.flatMap((s) => s.effects.map((e) => e.id)),
  };
}
