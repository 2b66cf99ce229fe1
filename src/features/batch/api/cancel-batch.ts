import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions } from './get-batch';

/** POST /api/batches/:id/cancel — stops a queued or running batch; finished structures are kept. */
export function cancelBatch(batchId: string) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/cancel`, { method: 'POST' });
}

export function useCancelBatch(slug: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => cancelBatch(batchId),
    onSettled: () => queryClient.invalidateQueries({ queryKey: batchQueryOptions(slug, batchId).queryKey }),
  });
}
