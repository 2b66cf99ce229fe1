import { useMutation, useQueryClient } from '@tanstack/react-query';
import { workspaceSchema } from '@shared/contracts/api';
import type { SnapSettings } from '@shared/contracts/settings';
import { apiFetch } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';
import { settingsKeys, workspacePath } from './paths';

/** PATCH /api/workspaces/:slug `{ defaults }` — the settings every new batch starts from (owners). */
export function updateDefaults(slug: string, defaults: SnapSettings) {
  return apiFetch(workspacePath(slug), { method: 'PATCH', body: { defaults }, schema: workspaceSchema });
}

export function useUpdateDefaults(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    // Every change here is written to the audit log; show it there at once.
    onSettled: () => queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }),
    mutationFn: (defaults: SnapSettings) => updateDefaults(slug, defaults),
    // The defaults reach every page through /api/me's memberships.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.me() }),
  });
}
