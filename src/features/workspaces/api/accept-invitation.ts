import { useMutation, useQueryClient } from '@tanstack/react-query';
import { invitationAcceptedSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** POST /api/invitations/:token/accept — join the workspace (signed in, in the browser). */
export function acceptInvitation(token: string) {
  return apiFetch(`/api/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST', schema: invitationAcceptedSchema });
}

export function useAcceptInvitation(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => acceptInvitation(token),
    // The new membership shows in /api/me: the switcher and the workspace routes read it.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.me() }),
  });
}
