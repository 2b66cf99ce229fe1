import { useMutation, useQueryClient } from '@tanstack/react-query';
import type * as z from 'zod';
import { invitationCreateSchema, invitationSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { invitationsQueryOptions } from './get-invitations';
import { settingsKeys, workspacePath } from './paths';

export type InvitationInput = z.infer<typeof invitationCreateSchema>;

/** POST /api/workspaces/:slug/invitations — invite an address with a role; the server mails the link. */
export function createInvitation(slug: string, input: InvitationInput) {
  return apiFetch(`${workspacePath(slug)}/invitations`, { method: 'POST', body: input, schema: invitationSchema });
}

export function useCreateInvitation(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    // Every change here is written to the audit log; show it there at once.
    onSettled: () => queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }),
    mutationFn: (input: InvitationInput) => createInvitation(slug, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(slug).queryKey }),
  });
}
