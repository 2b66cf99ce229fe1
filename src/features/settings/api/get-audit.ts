import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { auditEntrySchema, page } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { settingsKeys, workspacePath } from './paths';

export const auditPageSchema = page(auditEntrySchema);
export const AUDIT_PAGE_SIZE = 20;

/** GET /api/workspaces/:slug/audit — who did what, newest first (owners). */
export function fetchAudit(slug: string, pageNumber: number, signal?: AbortSignal) {
  return apiFetch(`${workspacePath(slug)}/audit`, {
    schema: auditPageSchema,
    query: { page: pageNumber, pageSize: AUDIT_PAGE_SIZE },
    signal,
  });
}

export const auditQueryOptions = (slug: string, pageNumber: number) =>
  queryOptions({
    queryKey: [...settingsKeys.audit(slug), { page: pageNumber }] as const,
    queryFn: ({ signal }) => fetchAudit(slug, pageNumber, signal),
  });

/** Not suspending: paging keeps the previous page on screen while the next loads. */
export function useAudit(slug: string, pageNumber: number) {
  return useQuery({ ...auditQueryOptions(slug, pageNumber), placeholderData: keepPreviousData });
}
