import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { structureQueryOptions } from './get-structure';

/**
 * POST /api/batches/:batchId/resnap with this one structure and target {kind:'group', group}:
 * queues a new snap to a rung of the ladder. The structure then polls until it is done.
 */
export function resnapStructure(batchId: string, structureId: string, group: string) {
  return apiFetch(`/api/batches/${encodeURIComponent(batchId)}/resnap`, {
    method: 'POST',
    body: { structureIds: [structureId], target: { kind: 'group', group } },
  });
}

export function useResnapStructure(slug: string, batchId: string, structureId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (group: string) => resnapStructure(batchId, structureId, group),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: structureQueryOptions(slug, structureId).queryKey }),
  });
}
