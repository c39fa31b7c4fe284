export const manipulationKeys = {
  all: ['manipulations'] as const,
  lists: () => [...manipulationKeys.all, 'list'] as const,
  list: (q: object) => [...manipulationKeys.lists(), q] as const,
};
