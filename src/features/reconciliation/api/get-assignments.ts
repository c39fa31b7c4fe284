import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AssignmentListQuery, AssignmentPage } from '../../../../shared/schemas/reconciliation';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Assignment as AssignmentRow } from '../../../../shared/schemas/reconciliation';

export type AssignmentsQuery = AssignmentListQuery;

export const getAssignments = (q: AssignmentsQuery) => api<AssignmentPage>(`/api/assignments${queryString({ ...q })}`);

export const assignmentsQueryOptions = (q: AssignmentsQuery) =>
  queryOptions({ queryKey: queryKeys.assignments.list(q), queryFn: () => getAssignments(q), placeholderData: keepPreviousData });

export function useAssignments(q: AssignmentsQuery) {
  return useQuery(assignmentsQueryOptions(q));
}
