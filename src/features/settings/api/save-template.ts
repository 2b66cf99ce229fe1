import { useMutation, useQueryClient } from '@tanstack/react-query';
import { exportTemplateSchema } from '@shared/contracts/api';
import { apiFetch } from '@/lib/api-client';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';
import { settingsKeys, workspacePath } from './paths';

export interface TemplateValues {
  name: string;
  fileExtension: string;
  body: string;
}

/** POST /api/workspaces/:slug/templates, or PATCH …/templates/:id when `id` is given (owners). */
export function saveTemplate(slug: string, values: TemplateValues, id?: string) {
  return id
    ? apiFetch(`${workspacePath(slug)}/templates/${encodeURIComponent(id)}`, { method: 'PATCH', body: values, schema: exportTemplateSchema })
    : apiFetch(`${workspacePath(slug)}/templates`, { method: 'POST', body: values, schema: exportTemplateSchema });
}

export function useSaveTemplate(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ values, id }: { values: TemplateValues; id?: string }) => saveTemplate(slug, values, id),
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: settingsKeys.audit(slug) }),
        queryClient.invalidateQueries({ queryKey: exportTemplatesQueryOptions(slug).queryKey }),
      ]),
  });
}
