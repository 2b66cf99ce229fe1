import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';
import { membersQueryOptions } from './get-members';
import { settingsKeys, workspacePath } from './paths';

/** DELETE /api/workspaces/:slug/members/:userId — remove someone (owners); the last owner can't go. */
export function removeMember(slug: string, userId: string) {
  return apiFetch(`${workspacePath(slug)}/members/${encodeURIComponent(userId)}`, { method: 'DELETE' });
}

export function useRemoveMember(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) => removeMember(slug, userId),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }), queryClient.invalidateQueries({ queryKey: membersQueryOptions(slug).queryKey })]),
  });
}
