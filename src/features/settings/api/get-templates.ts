import { useQuery } from '@tanstack/react-query';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';

/** The workspace's export templates (the loader starts the request; the section waits for it alone). */
export function useExportTemplates(slug: string) {
  return useQuery(exportTemplatesQueryOptions(slug));
}
