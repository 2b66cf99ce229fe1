import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { apiTokenSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { settingsKeys, workspacePath } from './paths';

export const apiTokensSchema = z.array(apiTokenSchema);
export type ApiToken = z.infer<typeof apiTokenSchema>;

/** GET /api/workspaces/:slug/tokens — your tokens (owners: everyone's), never the secrets. */
export function fetchTokens(slug: string, signal?: AbortSignal) {
  return apiFetch(`${workspacePath(slug)}/tokens`, { schema: apiTokensSchema, signal });
}

export const tokensQueryOptions = (slug: string) =>
  queryOptions({ queryKey: settingsKeys.tokens(slug), queryFn: ({ signal }) => fetchTokens(slug, signal) });

export function useTokens(slug: string) {
  return useSuspenseQuery(tokensQueryOptions(slug)).data;
}
