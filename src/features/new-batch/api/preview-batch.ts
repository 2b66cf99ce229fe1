import { useMutation } from '@tanstack/react-query';
import * as z from 'zod';
import { apiFetch } from '@/lib/api-client';

/**
 * POST /api/workspaces/:slug/batches/preview — what the server recognises in the files (formats,
 * frames, structures, parse errors naming file and line), without storing anything.
 *
 * The response shape is read leniently: the batches module owns it, and the page shows whatever
 * of these fields it finds.
 */
export const batchPreviewSchema = z.object({
  files: z
    .array(
      z.object({
        name: z.string(),
        format: z.string().nullable().optional(),
        bytes: z.number().int().optional(),
        frames: z.number().int().optional(),
        structures: z.number().int().optional(),
      }),
    )
    .default([]),
  formats: z.record(z.string(), z.number()).optional(),
  frames: z.number().int().optional(),
  atoms: z.number().int().optional(),
  structures: z
    .union([
      z.number().int(),
      z.array(
        z.object({
          name: z.string(),
          sourceFile: z.string().optional(),
          frameIndex: z.number().int().optional(),
          formula: z.string().nullable().optional(),
          atomCount: z.number().int().optional(),
        }),
      ),
    ])
    .optional(),
  errors: z
    .array(
      z.object({
        file: z.string().optional(),
        /** 0-based index of the frame in its file. */
        frame: z.number().int().nullable().optional(),
        line: z.number().int().nullable().optional(),
        message: z.string(),
      }),
    )
    .default([]),
});
export type BatchPreview = z.infer<typeof batchPreviewSchema>;

export function previewBatch(slug: string, files: readonly File[], signal?: AbortSignal) {
  const form = new FormData();
  for (const file of files) form.append('files', file, file.name);
  return apiFetch(`/api/workspaces/${encodeURIComponent(slug)}/batches/preview`, {
    method: 'POST',
    schema: batchPreviewSchema,
    body: form,
    signal,
  });
}

export function usePreviewBatch(slug: string) {
  return useMutation({ mutationFn: (files: readonly File[]) => previewBatch(slug, files) });
}
