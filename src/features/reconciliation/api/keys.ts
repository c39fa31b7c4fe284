export const reconciliationKeys = {
  all: ['reconciliation'] as const,
  queue: (q: object) => [...reconciliationKeys.all, 'queue', q] as const,
  pairs: () => [...reconciliationKeys.all, 'pair'] as const,
  pair: (id: number) => [...reconciliationKeys.pairs(), id] as const,
  assignments: (q: object) => [...reconciliationKeys.all, 'assignments', q] as const,
  candidates: (q: object) => [...reconciliationKeys.all, 'candidates', q] as const,
  coders: () => [...reconciliationKeys.all, 'coders'] as const,
  records: (referenceId: number) => [...reconciliationKeys.all, 'records', referenceId] as const,
  record: (id: number) => [...reconciliationKeys.all, 'record', id] as const,
};
