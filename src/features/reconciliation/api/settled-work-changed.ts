import type { QueryClient } from '@tanstack/react-query';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

/** After settling, reopening or withdrawing: the curators' screens and everything computed from settled data. */
export function settledWorkChanged(qc: QueryClient): Promise<unknown> {
  return Promise.all([
    ...[queryKeys.records.all, queryKeys.reconciliation.all, queryKeys.assignments.all, queryKeys.extractions.all, queryKeys.agreement.all].map((queryKey) =>
      qc.invalidateQueries({ queryKey }),
    ),
    registryChanged(qc),
  ]);
}
