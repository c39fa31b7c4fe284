export const importsKeys = {
  all: ['imports'] as const,
  lists: () => [...importsKeys.all, 'list'] as const,
  list: (q: object) => [...importsKeys.lists(), q] as const,
  detail: (id: number) => [...importsKeys.all, 'detail', id] as const,
};
