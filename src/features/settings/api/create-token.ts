import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiTokenCreatedSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { tokensQueryOptions } from './get-tokens';
import { settingsKeys, workspacePath } from './paths';

/** POST /api/workspaces/:slug/tokens — a new token; the secret is in this answer only. */
export function createToken(slug: string, label: string) {
  return apiFetch(`${workspacePath(slug)}/tokens`, { method: 'POST', body: { label }, schema: apiTokenCreatedSchema });
}

export function useCreateToken(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    // Every change here is written to the audit log; show it there at once.
    onSettled: () => queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }),
    mutationFn: (label: string) => createToken(slug, label),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tokensQueryOptions(slug).queryKey }),
  });
}
