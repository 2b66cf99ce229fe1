import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';
import { settingsKeys, workspacePath } from './paths';

/** DELETE /api/workspaces/:slug/templates/:id (owners). Batches keep their own copies. */
export function deleteTemplate(slug: string, id: string) {
  return apiFetch(`${workspacePath(slug)}/templates/${encodeURIComponent(id)}`, { method: 'DELETE' });
}

export function useDeleteTemplate(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => deleteTemplate(slug, id),
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }),
        queryClient.invalidateQueries({ queryKey: exportTemplatesQueryOptions(slug).queryKey }),
      ]),
  });
}
