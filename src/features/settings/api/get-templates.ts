import { useSuspenseQuery } from '@tanstack/react-query';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';

/** The workspace's export templates (the loader warms them for owners). */
export function useExportTemplates(slug: string) {
  return useSuspenseQuery(exportTemplatesQueryOptions(slug)).data;
}
