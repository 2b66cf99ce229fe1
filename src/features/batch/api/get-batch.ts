import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import type * as z from 'zod';
import { batchDetailSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';

export type BatchDetail = z.infer<typeof batchDetailSchema>;

/** Live progress: poll this often (ms) while the batch is queued or running. */
export const LIVE_INTERVAL = 1500;

/** True while the worker may still change the batch. */
export const isLive = (status: BatchDetail['status'] | undefined) => status === 'queued' || status === 'running';

/** GET /api/batches/:id — the batch with its counts, groups, settings and files. */
export function fetchBatch(batchId: string, signal?: AbortSignal) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}`, { schema: batchDetailSchema, signal });
}

/**
 * The batch, polled every 1.5 s while it runs. Its key is the prefix of every query about this
 * batch (structures, reviews), so invalidating it refreshes the whole page.
 */
export const batchQueryOptions = (slug: string, batchId: string) =>
  queryOptions({
    queryKey: ['batches', slug, 'detail', batchId] as const,
    queryFn: ({ signal }) => fetchBatch(batchId, signal),
    // Short: re-snaps started from a structure page change it behind this page's back.
    staleTime: 2_000,
    refetchInterval: (query) => (isLive(query.state.data?.status) ? LIVE_INTERVAL : false),
  });

export function useBatch(slug: string, batchId: string) {
  return useSuspenseQuery(batchQueryOptions(slug, batchId)).data;
}
