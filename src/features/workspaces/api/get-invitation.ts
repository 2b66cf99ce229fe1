import { queryOptions, useQuery } from '@tanstack/react-query';
import { invitationPeekSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';

/** GET /api/invitations/:token — public: what the link is for, shown before signing in. */
export function fetchInvitation(token: string, signal?: AbortSignal) {
  return apiFetch(`/api/invitations/${encodeURIComponent(token)}`, { schema: invitationPeekSchema, signal });
}

export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: ['invitations', token] as const, queryFn: ({ signal }) => fetchInvitation(token, signal) });

/** Not suspending: a bad link is an expected answer here, shown in the page rather than as an error page. */
export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
