import { EXCLUSION_REASON_LABELS, STAGE_REASONS, type ExclusionReason, type ScreeningStage, type ScreeningStatus } from '../../shared/vocabulary/screening.js';
import { UnprocessableError } from '../lib/errors.js';

/** A stage as it reads inside a sentence. */
export const STAGE_WORD: Record<ScreeningStage, string> = { title_abstract: 'title and abstract', full_text: 'full-text' };

/** The status of a reference waiting for a decision at a stage. */
export const WAITING_AT: Record<ScreeningStage, ScreeningStatus> = { title_abstract: 'unscreened', full_text: 'awaiting_full_text' };

const reasonList = (stage: ScreeningStage) => STAGE_REASONS[stage].map((x) => `“${EXCLUSION_REASON_LABELS[x]}”`).join(', ');

/** Each stage's own reasons (PRISMA 2020 item 16: reports excluded at full text, each with its reason). */
export function checkReason(refId: number, stage: ScreeningStage, input: { decision: string; reason?: ExclusionReason }) {
  if (input.decision !== 'excluded') return;
  if (!input.reason && stage === 'full_text')
    throw new UnprocessableError(`Reference ${refId} is at the full-text stage, where an exclusion needs a reason: pick one of ${reasonList(stage)}.`, { field: 'reason', stage });
  if (input.reason && !STAGE_REASONS[stage].includes(input.reason))
    throw new UnprocessableError(
      `“${EXCLUSION_REASON_LABELS[input.reason]}” is not a reason at the ${STAGE_WORD[stage]} stage of reference ${refId}; pick one of ${reasonList(stage)}.`,
      { field: 'reason', stage },
    );
}
