import type { Knex } from 'knex';
import type { Db } from '../repositories/db.js';
import { querySynthesisRows, settledReferenceCount } from '../repositories/effects.js';
import { codedReferenceCount } from '../repositories/extractions.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { filterSettledEffects } from './settled-effects-cache.js';
import { prismaCounts } from './screening.js';
import { requestFilters } from './synthesis.js';
import { EXCLUSION_COUNT_LABELS, NO_REASON } from '../../shared/vocabulary/screening.js';
import { enteringCounts, filterAttribution, NO_MANIPULATION_REASON, synthesisFlow, type SynthesisFlow } from '../../shared/synthesis/flow.js';
import { prismaFlowSvg } from '../../shared/plots/prisma-flow.js';
import type { SynthesisFlowAnswer, SynthesisRequest } from '../../shared/schemas/synthesis.js';

/**
 * The flow of records into one synthesis, counted in the caller's view of the data (pass the transaction a
 * snapshot is saved in): screening, coding, settling, and which filter set each settled reference aside.
 */
export async function flowIn(db: Db, request: SynthesisRequest): Promise<SynthesisFlow> {
  // In turn: db may be a transaction (one connection).
  const c = await prismaCounts(db);
  const coded = await codedReferenceCount(db);
  const settled = await settledReferenceCount(db);
  const all = await querySynthesisRows(db, {});
  const filters = requestFilters(request);
  const entering = enteringCounts(filterSettledEffects(all, filters));
  const outsideByStep = filterAttribution(all, filters, filterSettledEffects);
  const withTerm = new Set(all.map((e) => e.referenceId)).size;
  if (settled > withTerm) outsideByStep[NO_MANIPULATION_REASON.reason] = settled - withTerm;
  return synthesisFlow({
    identified: c.identified,
    duplicatesRemoved: c.duplicatesRemoved,
    screeningStages: c.stages,
    // each stage has its own box, so an exclusion without a reason needs no stage named
    reasonLabels: { ...EXCLUSION_COUNT_LABELS, [NO_REASON]: 'No reason given' },
    coded,
    settled,
    outsideByStep,
    entering,
  });
}

/** POST /api/syntheses/flow: the flow of a live synthesis, from one consistent view of the registry. */
export async function liveSynthesisFlow(db: Knex, request: SynthesisRequest): Promise<SynthesisFlowAnswer> {
  return db.transaction(async (trx) => ({ registryVersion: await currentRegistryVersion(trx), flow: await flowIn(trx, request) }), {
    isolationLevel: 'repeatable read',
    readOnly: true,
  });
}

export const flowSvg = (flow: SynthesisFlow, title: string) => prismaFlowSvg(flow, { title });
