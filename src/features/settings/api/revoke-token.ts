import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiTokenSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { tokensQueryOptions } from './get-tokens';
import { settingsKeys, workspacePath } from './paths';

/** DELETE /api/workspaces/:slug/tokens/:id — the token stops working at once. */
export function revokeToken(slug: string, id: string) {
  return apiFetch(`${workspacePath(slug)}/tokens/${encodeURIComponent(id)}`, { method: 'DELETE', schema: apiTokenSchema });
}

export function useRevokeToken(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => revokeToken(slug, id),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }), queryClient.invalidateQueries({ queryKey: tokensQueryOptions(slug).queryKey })]),
  });
}
