import type { QueryClient } from '@tanstack/react-query';
import { queryKeys } from './keys';

/** What is computed from settled effects, and so must be asked for again whenever they change. */
export const SETTLED_DATA_KEYS = [
  queryKeys.synthesis.all,
  queryKeys.atlas.all,
  queryKeys.effects.all,
  queryKeys.snapshots.diffs(),
  queryKeys.follows.changesAll(),
  queryKeys.search.all,
  // the vocabulary lists count settled effects per term
  queryKeys.manipulations.lists(),
] as const;

/**
 * Every mutation that changes settled data (settle, withdraw, edit an effect, merge or edit references, vocabulary
 * edits, reopen) calls this once, besides invalidating its own domain.
 */
export function registryChanged(qc: QueryClient): Promise<void> {
  return Promise.all(SETTLED_DATA_KEYS.map((queryKey) => qc.invalidateQueries({ queryKey }))).then(() => undefined);
}
