import type * as z from 'zod';
import { ApiError, errorFromBody } from './api-client';

/**
 * Multipart POST with upload progress. fetch() reports no upload progress, so this uses
 * XMLHttpRequest; errors and the response are treated exactly as in `apiFetch`.
 */
export function postWithProgress<S extends z.ZodType>(
  url: string,
  form: FormData,
  { schema, onProgress, signal }: { schema: S; onProgress?: (loaded: number, total: number) => void; signal?: AbortSignal },
): Promise<z.infer<S>> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress?.(event.loaded, event.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload was interrupted. Check your connection and try again.'));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    xhr.onload = () => {
      let json: unknown;
      try {
        json = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        json = undefined;
      }
      if (xhr.status < 200 || xhr.status >= 300) {
        reject(errorFromBody(xhr.status, xhr.statusText, json));
        return;
      }
      const parsed = schema.safeParse(json);
      if (!parsed.success) {
        reject(new ApiError(xhr.status, 'contract', `Unexpected response from POST ${url}`));
        return;
      }
      resolve(parsed.data);
    };
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}

/**
 * Splits the bytes sent of one multipart body into per-file progress (0–1), by the files' order
 * and sizes in the body. Multipart headers make this approximate by a few hundred bytes per file.
 */
export function perFileProgress(sizes: readonly number[], loaded: number, total: number): number[] {
  const payload = sizes.reduce((a, b) => a + b, 0);
  // Scale the bytes sent to the files' share of the body (the rest is multipart framing and fields).
  const sent = total > 0 ? (loaded / total) * payload : 0;
  let offset = 0;
  return sizes.map((size) => {
    const start = offset;
    offset += size;
    if (size === 0) return sent >= start ? 1 : 0;
    return Math.max(0, Math.min(1, (sent - start) / size));
  });
}
