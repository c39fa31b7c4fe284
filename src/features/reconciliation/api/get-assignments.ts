import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface AssignmentsQuery {
  state?: string;
  page: number;
  pageSize: number;
  sort: 'id' | 'updated' | 'reference';
  order: 'asc' | 'desc';
}
export interface AssignmentRow {
  id: number;
  referenceId: number;
  referenceLabel: string;
  title: string;
  state: string;
  coder1: string;
  coder2: string;
  submitted: number;
  openDiscrepancies: number;
  updatedAt: string;
}

export const getAssignments = (q: AssignmentsQuery) => api<{ items: AssignmentRow[]; total: number }>(`/api/assignments${queryString({ ...q })}`);

export const assignmentsQueryOptions = (q: AssignmentsQuery) =>
  queryOptions({ queryKey: queryKeys.assignments.list(q), queryFn: () => getAssignments(q), placeholderData: keepPreviousData });

export function useAssignments(q: AssignmentsQuery) {
  return useQuery(assignmentsQueryOptions(q));
}
