import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import type * as z from 'zod';
import { batchStatusSchema, batchSummarySchema, page } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export const batchPageSchema = page(batchSummarySchema);
export type BatchPage = z.infer<typeof batchPageSchema>;
export type BatchStatus = z.infer<typeof batchStatusSchema>;

/** What the batches table is filtered by; every field is part of the query key. */
export interface BatchFilters {
  status?: BatchStatus;
  q?: string;
  page: number;
  pageSize: number;
}

export const BATCHES_PAGE_SIZE = 25;
/** How often the list refreshes while a batch on it is queued or running. */
export const LIVE_POLL_MS = 1500;

/** Reads filters from the page URL (`?status=running&q=ligand&page=2`), ignoring bad values. */
export function filtersFromSearch(search: URLSearchParams): BatchFilters {
  const status = batchStatusSchema.safeParse(search.get('status'));
  const q = (search.get('q') ?? '').trim().slice(0, 200);
  const pageNumber = Number.parseInt(search.get('page') ?? '1', 10);
  return {
    status: status.success ? status.data : undefined,
    q: q || undefined,
    page: Number.isFinite(pageNumber) && pageNumber >= 1 ? pageNumber : 1,
    pageSize: BATCHES_PAGE_SIZE,
  };
}

/** GET /api/workspaces/:slug/batches — one page of the workspace's batches, newest first. */
export function fetchBatches(slug: string, filters: BatchFilters, signal?: AbortSignal) {
  return apiFetch(`/api/workspaces/${encodeURIComponent(slug)}/batches`, {
    schema: batchPageSchema,
    query: { status: filters.status, q: filters.q, page: filters.page, pageSize: filters.pageSize },
    signal,
  });
}

/** True while any batch on the page still has work to do. */
export function hasLiveBatches(data: BatchPage | undefined): boolean {
  return !!data?.items.some((b) => b.status === 'queued' || b.status === 'running');
}

export const batchesQueryOptions = (slug: string, filters: BatchFilters) =>
  queryOptions({
    queryKey: [...queryKeys.batches(slug), 'list', filters] as const,
    queryFn: ({ signal }) => fetchBatches(slug, filters, signal),
    // Poll only while something runs; a page of finished batches stays still.
    refetchInterval: (query) => (hasLiveBatches(query.state.data) ? LIVE_POLL_MS : false),
  });

export function useBatches(slug: string, filters: BatchFilters) {
  return useSuspenseQuery(batchesQueryOptions(slug, filters)).data;
}
