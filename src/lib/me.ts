import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { meSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/me (core to every page, hence in lib/) — the signed-in user and their workspaces with a role in each. 401 when signed out. */
export function fetchMe(signal?: AbortSignal) {
  return apiFetch('/api/me', { schema: meSchema, signal });
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: queryKeys.me(),
    queryFn: ({ signal }) => fetchMe(signal),
    staleTime: 60_000,
  });

export function useMe() {
  return useSuspenseQuery(meQueryOptions()).data;
}
