import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { page, reviewEventSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions } from './get-batch';

export type ReviewEvent = z.infer<typeof reviewEventSchema>;

// The history comes as a plain array; a paginated answer is read too (first page) so a later
// switch on the server does not break the page.
const reviewHistorySchema = z
  .union([z.array(reviewEventSchema), page(reviewEventSchema)])
  .transform((body) => (Array.isArray(body) ? body : body.items));

/** GET /api/batches/:id/reviews — every decision and the sign-off, newest first. */
export function fetchBatchReviews(batchId: string, signal?: AbortSignal) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/reviews`, { schema: reviewHistorySchema, signal });
}

export const batchReviewsQueryOptions = (slug: string, batchId: string) =>
  queryOptions({
    queryKey: [...batchQueryOptions(slug, batchId).queryKey, 'reviews'] as const,
    queryFn: ({ signal }) => fetchBatchReviews(batchId, signal),
    staleTime: 2_000,
  });

export function useBatchReviews(slug: string, batchId: string) {
  return useSuspenseQuery(batchReviewsQueryOptions(slug, batchId)).data;
}
