import type { QueryClient } from '@tanstack/react-query';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

/**
 * After decisions land or are taken back: the queue and counts, the references and the search index (it carries the
 * screening status) change; `settled` when an exclusion withdrew settled records or an undo settled them again.
 */
export const screeningChanged = (qc: QueryClient, settled: boolean) =>
  Promise.all([
    qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
    qc.invalidateQueries({ queryKey: queryKeys.references.all }),
    qc.invalidateQueries({ queryKey: queryKeys.search.all }),
    settled ? registryChanged(qc) : undefined,
  ]);
