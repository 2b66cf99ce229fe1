import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { structureDetailSchema, type StructureDetail } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';

/** Poll this often (ms) while a (re-)snap of the structure is queued or running. */
export const LIVE_INTERVAL = 1500;
export const isLive = (status: StructureDetail['status'] | undefined) => status === 'queued' || status === 'running';

/** GET /api/structures/:id — the structure with its input atoms, result (null until done) and reviews. */
export function fetchStructure(structureId: string, signal?: AbortSignal) {
  return apiFetch(`/api/structures/${encodeURIComponent(structureId)}`, { schema: structureDetailSchema, signal });
}

export const structureQueryOptions = (slug: string, structureId: string) =>
  queryOptions({
    queryKey: ['structures', slug, 'detail', structureId] as const,
    queryFn: ({ signal }) => fetchStructure(structureId, signal),
    staleTime: 2_000,
    refetchInterval: (query) => (isLive(query.state.data?.status) ? LIVE_INTERVAL : false),
  });

export function useStructure(slug: string, structureId: string) {
  return useSuspenseQuery(structureQueryOptions(slug, structureId)).data;
}
