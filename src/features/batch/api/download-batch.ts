import { useCallback, useEffect, useRef, useState } from 'react';
import { ApiError, errorFromBody } from '@/lib/api-client';

/** Progress of a streamed download: bytes so far and, when the server says it, the total. */
export interface DownloadProgress {
  received: number;
  total: number | null;
}

/** The file name from `Content-Disposition` (`filename*=UTF-8''…` or `filename="…"`), else `fallback`. */
export function fileNameFrom(disposition: string | null, fallback: string): string {
  if (!disposition) return fallback;
  const star = /filename\*\s*=\s*(?:UTF-8'')?([^;]+)/i.exec(disposition);
  if (star) {
    try {
      return decodeURIComponent(star[1].trim().replace(/^"|"$/g, ''));
    } catch {
      /* fall through to the plain form */
    }
  }
  const plain = /filename\s*=\s*"?([^";]+)"?/i.exec(disposition);
  return plain ? plain[1].trim() : fallback;
}

/**
 * Reads a response body chunk by chunk with its stream reader, reporting bytes received after
 * each chunk, and returns the whole body as a Blob. The ZIP is built while it streams, so the
 * total is usually unknown (no Content-Length): progress is then bytes only.
 */
export async function readWithProgress(response: Response, onProgress: (p: DownloadProgress) => void): Promise<Blob> {
  const length = Number(response.headers.get('Content-Length'));
  const total = Number.isFinite(length) && length > 0 ? length : null;
  const type = response.headers.get('Content-Type') ?? 'application/octet-stream';
  if (!response.body) {
    const blob = await response.blob();
    onProgress({ received: blob.size, total });
    return blob;
  }
  const reader = response.body.getReader();
  const chunks: Uint8Array[] = [];
  let received = 0;
  onProgress({ received, total });
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    received += value.byteLength;
    onProgress({ received, total });
  }
  return new Blob(chunks as BlobPart[], { type });
}

/** Hands a Blob to the browser as a file download through a temporary object URL. */
export function saveBlob(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.append(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before the URL goes away.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export type DownloadState =
  | { phase: 'idle' }
  | { phase: 'running'; progress: DownloadProgress }
  | { phase: 'done'; fileName: string; bytes: number }
  | { phase: 'error'; message: string };

/**
 * GET `path` as a file with progress (used for GET /api/batches/:id/download, the ZIP with
 * manifest.json). `start()` begins, `cancel()` aborts; the state says how far it got.
 */
export function useStreamedDownload(path: string, fallbackName: string) {
  const [state, setState] = useState<DownloadState>({ phase: 'idle' });
  const controller = useRef<AbortController | null>(null);
  useEffect(() => () => controller.current?.abort(), []);

  const start = useCallback(async () => {
    controller.current?.abort();
    const abort = new AbortController();
    controller.current = abort;
    setState({ phase: 'running', progress: { received: 0, total: null } });
    try {
      const response = await fetch(path, { credentials: 'same-origin', signal: abort.signal });
      if (!response.ok) {
        let body: unknown;
        try {
          body = await response.json();
        } catch {
          body = undefined;
        }
        throw errorFromBody(response.status, response.statusText, body);
      }
      const blob = await readWithProgress(response, (progress) => setState({ phase: 'running', progress }));
      const fileName = fileNameFrom(response.headers.get('Content-Disposition'), fallbackName);
      saveBlob(blob, fileName);
      setState({ phase: 'done', fileName, bytes: blob.size });
    } catch (error) {
      if ((error as Error)?.name === 'AbortError') {
        setState({ phase: 'idle' });
        return;
      }
      const message =
        error instanceof ApiError ? error.message : 'The download was interrupted. Check your connection and try again.';
      setState({ phase: 'error', message });
    } finally {
      if (controller.current === abort) controller.current = null;
    }
  }, [path, fallbackName]);

  const cancel = useCallback(() => controller.current?.abort(), []);
  return { state, start, cancel };
}
