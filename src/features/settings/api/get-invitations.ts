import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { invitationSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { settingsKeys, workspacePath } from './paths';

export const invitationsSchema = z.array(invitationSchema);
export type Invitation = z.infer<typeof invitationSchema>;

/** GET /api/workspaces/:slug/invitations — pending and past invitations (owners). */
export function fetchInvitations(slug: string, signal?: AbortSignal) {
  return apiFetch(`${workspacePath(slug)}/invitations`, { schema: invitationsSchema, signal });
}

export const invitationsQueryOptions = (slug: string) =>
  queryOptions({ queryKey: settingsKeys.invitations(slug), queryFn: ({ signal }) => fetchInvitations(slug, signal) });

export function useInvitations(slug: string) {
  return useSuspenseQuery(invitationsQueryOptions(slug)).data;
}
