import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { batchQueryOptions } from './get-batch';

/** POST /api/batches/:id/sign-off — a reviewer (or owner) signs the batch off once every structure is decided. */
export function signOffBatch(batchId: string, comment: string) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/sign-off`, { method: 'POST', body: { comment } });
}

export function useSignOffBatch(slug: string, batchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (comment: string) => signOffBatch(batchId, comment),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: batchQueryOptions(slug, batchId).queryKey }),
  });
}
