import { queryOptions, useQuery } from '@tanstack/react-query';
import * as z from 'zod';
import { devMailMessageSchema } from '@shared/contracts/api';
import { apiFetch, isApiError } from '@/lib/api-client';
import { settingsKeys, workspacePath } from './paths';

export const devMailboxSchema = z.array(devMailMessageSchema);

/**
 * GET /api/workspaces/:slug/dev-mailbox — the local fake inbox, in development only. A 404
 * means the mailbox is switched off: answered as `null` so the section hides.
 */
export async function fetchDevMailbox(slug: string, signal?: AbortSignal) {
  try {
    return await apiFetch(`${workspacePath(slug)}/dev-mailbox`, { schema: devMailboxSchema, signal });
  } catch (error) {
    if (isApiError(error, 404)) return null;
    throw error;
  }
}

export const devMailboxQueryOptions = (slug: string) =>
  queryOptions({ queryKey: settingsKeys.devMailbox(slug), queryFn: ({ signal }) => fetchDevMailbox(slug, signal) });

export function useDevMailbox(slug: string) {
  return useQuery(devMailboxQueryOptions(slug));
}
