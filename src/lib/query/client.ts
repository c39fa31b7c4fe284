import { QueryClient } from '@tanstack/react-query';

/** The one query cache: the providers and the route loaders share it. */
export const queryClient = new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } });
