import { useMutation, useQueryClient } from '@tanstack/react-query';
import type * as z from 'zod';
import type { resnapRequestSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions } from './get-batch';

export type ResnapRequest = z.infer<typeof resnapRequestSchema>;

/** POST /api/batches/:id/resnap — queues the given structures again with another target group. */
export function resnapStructures(batchId: string, request: ResnapRequest) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/resnap`, { method: 'POST', body: request });
}

export function useResnapStructures(slug: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (request: ResnapRequest) => resnapStructures(batchId, request),
    // The batch goes back to running and polls; refresh it (and its rows) now.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: batchQueryOptions(slug, batchId).queryKey }),
  });
}
