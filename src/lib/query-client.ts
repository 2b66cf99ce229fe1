import { QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

/**
 * One QueryClient per page load. Route loaders import `queryClient` to warm the cache
 * (`queryClient.ensureQueryData(options)`); components read it with `useSuspenseQuery`.
 * 4xx answers are final (a 404 stays a 404), so only network and 5xx errors are retried.
 */
export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 10_000,
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 2;
        },
        refetchOnWindowFocus: true,
      },
      mutations: { retry: false },
    },
  });
}

export const queryClient = createQueryClient();
