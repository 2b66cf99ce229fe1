import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { batchSummarySchema } from '@shared/contracts/api';
import type { SnapSettings } from '@shared/contracts/settings';
import { queryKeys } from '@/lib/query-keys';
import { perFileProgress, postWithProgress } from '@/lib/upload';

export interface CreateBatchInput {
  name: string;
  files: readonly File[];
  settings: SnapSettings;
  /** Export templates chosen for the batch; omitted from the upload when empty. */
  templateIds?: readonly string[];
}

/**
 * POST /api/workspaces/:slug/batches (multipart: `files`, `settings` as JSON, `name`), reporting
 * upload progress per file (0–1) through `onProgress`.
 */
export function createBatch(slug: string, input: CreateBatchInput, onProgress?: (perFile: number[]) => void) {
  const form = new FormData();
  form.append('name', input.name);
  form.append('settings', JSON.stringify(input.settings));
  if (input.templateIds && input.templateIds.length > 0) form.append('templateIds', JSON.stringify(input.templateIds));
  for (const file of input.files) form.append('files', file, file.name);
  const sizes = input.files.map((f) => f.size);
  return postWithProgress(`/api/workspaces/${encodeURIComponent(slug)}/batches`, form, {
    schema: batchSummarySchema,
    onProgress: (loaded, total) => onProgress?.(perFileProgress(sizes, loaded, total)),
  });
}

/** Creates a batch with per-file progress; refreshes the workspace's batch lists afterwards. */
export function useCreateBatch(slug: string) {
  const queryClient = useQueryClient();
  const [progress, setProgress] = useState<number[] | null>(null);
  const mutation = useMutation({
    mutationFn: (input: CreateBatchInput) => {
      setProgress(input.files.map(() => 0));
      return createBatch(slug, input, setProgress);
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.batches(slug) }),
    onSettled: () => setProgress(null),
  });
  return { ...mutation, progress };
}
