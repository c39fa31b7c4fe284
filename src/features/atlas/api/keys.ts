export interface ReferencesQuery {
  page: number;
  pageSize: number;
  sort: 'year' | 'label' | 'title' | 'effects';
  order: 'asc' | 'desc';
}

export const atlasKeys = {
  all: ['atlas'] as const,
  landing: () => [...atlasKeys.all, 'landing'] as const,
  manipulations: () => [...atlasKeys.all, 'manipulation'] as const,
  manipulation: (term: string) => [...atlasKeys.manipulations(), term] as const,
  outcomes: () => [...atlasKeys.all, 'outcome'] as const,
  outcome: (kind: string) => [...atlasKeys.outcomes(), kind] as const,
  references: (scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) => [...atlasKeys.all, 'references', scope, slug, q] as const,
};
