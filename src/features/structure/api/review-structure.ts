import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { structureQueryOptions } from './get-structure';

export type Decision = 'accepted' | 'flagged';

/** POST /api/batches/:batchId/reviews for this one structure (reviewers and owners). */
export function reviewStructure(batchId: string, structureId: string, decision: Decision, comment: string) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/reviews`, {
    method: 'POST',
    body: { structureIds: [structureId], decision, comment },
  });
}

export function useReviewStructure(slug: string, batchId: string, structureId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ decision, comment }: { decision: Decision; comment: string }) => reviewStructure(batchId, structureId, decision, comment),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: structureQueryOptions(slug, structureId).queryKey }),
  });
}
