import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { page, structureListQuerySchema, structureRowSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions, isLive, LIVE_INTERVAL, type BatchDetail } from './get-batch';

export type StructureListQuery = z.infer<typeof structureListQuerySchema>;
export type StructureListInput = z.input<typeof structureListQuerySchema>;
export const structurePageSchema = page(structureRowSchema);
export type StructurePage = z.infer<typeof structurePageSchema>;

/** The table's state as read from the URL (`?sort=csm&dir=desc&group=C2v&page=2`), defaults filled in. */
export function parseStructureListQuery(params: URLSearchParams): StructureListQuery {
  const raw = Object.fromEntries([...params].filter(([, v]) => v !== ''));
  const parsed = structureListQuerySchema.safeParse(raw);
  // A hand-edited URL with a bad value falls back to the defaults rather than an error page.
  return parsed.success ? parsed.data : structureListQuerySchema.parse({});
}

/** GET /api/batches/:id/structures — one page of rows, sorted and filtered on the server. */
export function fetchBatchStructures(batchId: string, query: StructureListQuery, signal?: AbortSignal) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/structures`, {
    schema: structurePageSchema,
    query: { ...query },
    signal,
  });
}

export const batchStructuresQueryOptions = (slug: string, batchId: string, query: StructureListQuery, status?: BatchDetail['status']) =>
  queryOptions({
    queryKey: [...batchQueryOptions(slug, batchId).queryKey, 'structures', query] as const,
    queryFn: ({ signal }) => fetchBatchStructures(batchId, query, signal),
    staleTime: 2_000,
    refetchInterval: isLive(status) ? LIVE_INTERVAL : false,
  });

/**
 * Rows of the current page. The route loader has already fetched them for the URL's query (a
 * sort, filter or page change is a navigation), so this does not suspend on a table change.
 */
export function useBatchStructures(slug: string, batchId: string, query: StructureListQuery, status?: BatchDetail['status']) {
  return useSuspenseQuery(batchStructuresQueryOptions(slug, batchId, query, status)).data;
}
