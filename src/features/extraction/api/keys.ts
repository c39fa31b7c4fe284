export const extractionKeys = {
  all: ['extractions'] as const,
  lists: () => [...extractionKeys.all, 'list'] as const,
  list: (q: object) => [...extractionKeys.lists(), q] as const,
  details: () => [...extractionKeys.all, 'detail'] as const,
  detail: (id: number) => [...extractionKeys.details(), id] as const,
};
