import { queryOptions, useQuery } from '@tanstack/react-query';
import type * as z from 'zod';
import { displacementHistogramSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions, isLive, LIVE_INTERVAL, type BatchDetail } from './get-batch';

export type DisplacementCounts = z.infer<typeof displacementHistogramSchema>;

/**
 * GET /api/batches/:id/displacement-histogram — the largest displacement of every structure of
 * the batch, counted by the server into the shared bins (`@shared/contracts/histogram`).
 */
export function fetchDisplacementHistogram(batchId: string, signal?: AbortSignal): Promise<DisplacementCounts> {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/displacement-histogram`, { schema: displacementHistogramSchema, signal });
}

export const displacementHistogramQueryOptions = (slug: string, batchId: string) =>
  queryOptions({
    queryKey: [...batchQueryOptions(slug, batchId).queryKey, 'displacement-histogram'] as const,
    queryFn: ({ signal }) => fetchDisplacementHistogram(batchId, signal),
    staleTime: 5_000,
  });

/** Not a suspense query: the charts load after the table, in their own lazy chunk. */
export function useDisplacementHistogram(slug: string, batchId: string, status: BatchDetail['status']) {
  return useQuery({ ...displacementHistogramQueryOptions(slug, batchId), refetchInterval: isLive(status) ? LIVE_INTERVAL * 2 : false });
}
