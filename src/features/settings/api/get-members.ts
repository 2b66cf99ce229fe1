import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { memberSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { settingsKeys, workspacePath } from './paths';

export const membersSchema = z.array(memberSchema);
export type Member = z.infer<typeof memberSchema>;

/** GET /api/workspaces/:slug/members — everyone in the workspace with their role. */
export function fetchMembers(slug: string, signal?: AbortSignal) {
  return apiFetch(`${workspacePath(slug)}/members`, { schema: membersSchema, signal });
}

export const membersQueryOptions = (slug: string) =>
  queryOptions({ queryKey: settingsKeys.members(slug), queryFn: ({ signal }) => fetchMembers(slug, signal) });

export function useMembers(slug: string) {
  return useSuspenseQuery(membersQueryOptions(slug)).data;
}
