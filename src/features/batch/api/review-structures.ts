import { useMutation, useQueryClient } from '@tanstack/react-query';
import type * as z from 'zod';
import type { reviewRequestSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions } from './get-batch';

export type ReviewRequest = z.input<typeof reviewRequestSchema>;

/** POST /api/batches/:id/reviews — accept or flag structures with one comment (reviewers, owners). */
export function reviewStructures(batchId: string, request: ReviewRequest) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/reviews`, { method: 'POST', body: request });
}

export function useReviewStructures(slug: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (request: ReviewRequest) => reviewStructures(batchId, request),
    // Counts, rows and history all change: refresh everything under the batch.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: batchQueryOptions(slug, batchId).queryKey }),
  });
}
