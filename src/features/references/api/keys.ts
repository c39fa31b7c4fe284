import type { ReferenceListQuery } from '../../../../shared/schemas/references';

export const referencesKeys = {
  all: ['references'] as const,
  lists: () => [...referencesKeys.all, 'list'] as const,
  list: (q: Partial<ReferenceListQuery>) => [...referencesKeys.lists(), q] as const,
  details: () => [...referencesKeys.all, 'detail'] as const,
  detail: (id: number) => [...referencesKeys.details(), id] as const,
  duplicates: (q: object) => [...referencesKeys.all, 'duplicates', q] as const,
};
