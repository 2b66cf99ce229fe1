import { queryOptions } from '@tanstack/react-query';
import * as z from 'zod';
import { exportTemplateSchema, type ExportTemplateDto } from '@shared/contracts/api';
import { apiFetch } from './api-client';
import { queryKeys } from './query-keys';

/**
 * GET /api/workspaces/:slug/templates — the workspace's export templates. Shared by the settings
 * page (owners edit them) and the new-batch form (chemists choose them), so both read one cache entry.
 */
export const exportTemplatesSchema = z.array(exportTemplateSchema);
export type ExportTemplate = ExportTemplateDto;

export function fetchExportTemplates(slug: string, signal?: AbortSignal) {
  return apiFetch(`/api/workspaces/${encodeURIComponent(slug)}/templates`, { schema: exportTemplatesSchema, signal });
}

export const exportTemplatesQueryOptions = (slug: string) =>
  queryOptions({ queryKey: [...queryKeys.workspace(slug), 'templates'] as const, queryFn: ({ signal }) => fetchExportTemplates(slug, signal) });
