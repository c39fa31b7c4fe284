export const screeningKeys = {
  all: ['screening'] as const,
  queue: (q: object) => [...screeningKeys.all, 'queue', q] as const,
  counts: () => [...screeningKeys.all, 'counts'] as const,
};
