import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import type { ImportState } from '../../../../shared/schemas/references';
import { queryKeys } from '../../../lib/query/keys';
import { batchAtWork } from './get-import';

/** When a batch seen at work finishes (or fails), the references it made appear elsewhere: ask for those lists again. */
export function useRefreshWhenFinished(state: ImportState | undefined) {
  const qc = useQueryClient();
  const wasAtWork = useRef(false);
  useEffect(() => {
    if (batchAtWork(state)) wasAtWork.current = true;
    else if (state && wasAtWork.current) {
      wasAtWork.current = false;
      for (const queryKey of [queryKeys.imports.lists(), queryKeys.references.all, queryKeys.screening.all, queryKeys.duplicates.all, queryKeys.search.all]) {
        void qc.invalidateQueries({ queryKey });
      }
    }
  }, [state, qc]);
}
