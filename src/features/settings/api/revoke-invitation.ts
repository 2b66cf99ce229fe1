import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { invitationsQueryOptions } from './get-invitations';
import { settingsKeys, workspacePath } from './paths';

/** DELETE /api/workspaces/:slug/invitations/:id — the link stops working. */
export function revokeInvitation(slug: string, id: string) {
  return apiFetch(`${workspacePath(slug)}/invitations/${encodeURIComponent(id)}`, { method: 'DELETE' });
}

export function useRevokeInvitation(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => revokeInvitation(slug, id),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }), queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(slug).queryKey })]),
  });
}
