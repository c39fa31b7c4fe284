import { signReversal } from '../vocabulary/parameters.js';
import type { OutcomeKind } from '../vocabulary/outcomes.js';
import type { Parameter, Unit } from '../vocabulary/parameters.js';
import type { Task } from '../vocabulary/tasks.js';
import type { ComputeAttempt, ComputedEffect } from './compute.js';

type Oriented = { outcome?: OutcomeKind | null; parameter?: Parameter | null; unit?: Unit | null };

/**
 * The computed contrast in the outcome kind's sign convention: reversed (and marked, with the reason) where a lower
 * value means lengthening (shared/vocabulary/parameters.ts LOWER_MEANS_LONGER). A single raw mean is a level, never reversed.
 */
export function orientComputed(c: ComputedEffect, e: Oriented, task: Task | null | undefined): ComputedEffect {
  const reason = c.metric === 'raw_mean' ? null : signReversal(e, task);
  return reason ? { ...c, effect: c.effect === 0 ? 0 : -c.effect, signReversed: true, signReason: reason } : { ...c, signReversed: false };
}

/** orientComputed on an attempt (the live sheet, the server's save). */
export function orientAttempt(a: ComputeAttempt, e: Oriented, task: Task | null | undefined): ComputeAttempt {
  return a.ok && a.result ? { ...a, result: orientComputed(a.result, e, task) } : a;
}
