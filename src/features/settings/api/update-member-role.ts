import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@shared/contracts/api';
import { memberSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';
import { membersQueryOptions } from './get-members';
import { settingsKeys, workspacePath } from './paths';

/** PATCH /api/workspaces/:slug/members/:userId — change a member's role (owners). */
export function updateMemberRole(slug: string, userId: string, role: Role) {
  return apiFetch(`${workspacePath(slug)}/members/${encodeURIComponent(userId)}`, {
    method: 'PATCH',
    body: { role },
    schema: memberSchema,
  });
}

export function useUpdateMemberRole(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: Role }) => updateMemberRole(slug, userId, role),
    onSettled: () => {
      void queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) });
      void queryClient.invalidateQueries({ queryKey: membersQueryOptions(slug).queryKey });
      // Your own role may have changed: the rail and the pages read it from /api/me.
      void queryClient.invalidateQueries({ queryKey: queryKeys.me() });
    },
  });
}
