import { Button } from '@/components/ui/button';
import { InlineError } from '@/components/ui/states';
import { formatBytes } from '@/lib/format';
import { isLive, type BatchDetail } from '../api/get-batch';
import { useStreamedDownload } from '../api/download-batch';

/**
 * Downloads the whole batch (cleaned files, manifest.json, summary.csv) as a ZIP, streaming it
 * with a progress line in bytes (the ZIP is built on the fly, so its size is not known ahead).
 */
export function DownloadBatchButton({ batch }: { batch: BatchDetail }) {
  const safeName = batch.name.replace(/[^\w.-]+/g, '_') || 'batch';
  const { state, start, cancel } = useStreamedDownload(`/api/batches/${encodeURIComponent(batch.id)}/download`, `${safeName}.zip`);
  const live = isLive(batch.status);
  return (
    <div className="flex flex-col items-end gap-1">
      <div className="flex items-center gap-2">
        {state.phase === 'running' ? (
          <>
            <span role="status" className="num text-sm text-ink-soft">
              Downloading… {formatBytes(state.progress.received)}
              {state.progress.total ? ` of ${formatBytes(state.progress.total)}` : ' received'}
            </span>
            <Button variant="quiet" size="sm" onClick={cancel}>
              Stop
            </Button>
          </>
        ) : (
          <Button variant="secondary" onClick={start} disabled={live} title={live ? 'Available when the batch has finished' : undefined}>
            Download ZIP
          </Button>
        )}
      </div>
      {state.phase === 'done' && (
        <p role="status" className="text-xs text-moss">
          Saved {state.fileName} (<span className="num">{formatBytes(state.bytes)}</span>)
        </p>
      )}
      {live && state.phase === 'idle' && <p className="text-xs text-ink-faint">Download opens when the batch has finished.</p>}
      {state.phase === 'error' && <InlineError>{state.message}</InlineError>}
    </div>
  );
}
