import type { SearchQuery } from '../../../../shared/schemas/references';

export const searchKeys = {
  all: ['search'] as const,
  results: (q: Partial<SearchQuery>) => [...searchKeys.all, q] as const,
};
