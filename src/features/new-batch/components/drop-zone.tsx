import { useId, useRef, useState, type DragEvent } from 'react';
import { Button } from '@/components/ui/button';
import { ProgressBar } from '@/components/ui/progress-bar';
import { cx } from '@/lib/cx';
import { formatBytes } from '@/lib/format';

/** File types the engine reads (DESIGN.md, "Read"), and ZIP archives of them. */
export const ACCEPTED_EXTENSIONS = ['.xyz', '.extxyz', '.mol', '.sdf', '.sd', '.pdb', '.cml', '.json', '.zip'];

/** Adds files to a list, skipping exact repeats (same name, size and date). */
export function mergeFiles(current: readonly File[], added: readonly File[]): File[] {
  const key = (f: File) => `${f.name}\u0000${f.size}\u0000${f.lastModified}`;
  const seen = new Set(current.map(key));
  return [...current, ...added.filter((f) => !seen.has(key(f)) && (seen.add(key(f)), true))];
}

/**
 * Where files and ZIPs go: drop them, or choose them with the button (keyboard users). Lists the
 * files with their size, a remove button, and — while uploading — a progress bar each.
 */
export function DropZone({
  files,
  onChange,
  progress,
  disabled,
  error,
  describedBy,
}: {
  files: readonly File[];
  onChange: (files: File[]) => void;
  /** Per-file upload progress 0–1, in the order of `files`, while uploading. */
  progress?: number[] | null;
  disabled?: boolean;
  error?: string;
  describedBy?: string;
}) {
  const inputRef = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const id = useId();
  const errorId = `${id}-error`;

  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    setOver(false);
    if (disabled) return;
    onChange(mergeFiles(files, Array.from(event.dataTransfer.files)));
  };

  return (
    <div className="flex flex-col gap-3">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          if (!disabled) setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        className={cx(
          'flex flex-col items-center justify-center gap-3 rounded-xl border-2 border-dashed px-6 py-10 text-center transition-colors',
          over ? 'border-lapis bg-lapis-wash' : error ? 'border-brick/60 bg-brick-wash/40' : 'border-rule bg-card',
        )}
      >
        <svg viewBox="0 0 40 40" aria-hidden className="size-10" fill="none">
          <path d="M8 6h16l8 8v20H8z" stroke="var(--color-ink-faint)" strokeWidth="1.6" />
          <path d="M24 6v8h8" stroke="var(--color-saffron)" strokeWidth="1.6" />
          <path d="M20 30V18m0 0l-5 5m5-5l5 5" stroke="var(--color-lapis)" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        <p className="text-sm text-ink">
          <span className="font-medium">Drop geometry files or ZIPs here</span>
          <br />
          <span className="text-ink-soft">XYZ (one or many frames), extended XYZ, MOL/SDF, PDB, CML, QCSchema JSON</span>
        </p>
        <Button variant="secondary" size="sm" disabled={disabled} onClick={() => inputRef.current?.click()} aria-describedby={[describedBy, error ? errorId : undefined].filter(Boolean).join(' ') || undefined}>
          Choose files…
        </Button>
        <input
          ref={inputRef}
          type="file"
          multiple
          accept={ACCEPTED_EXTENSIONS.join(',')}
          className="sr-only"
          tabIndex={-1}
          aria-label="Geometry files or ZIPs"
          data-testid="file-input"
          onChange={(e) => {
            onChange(mergeFiles(files, Array.from(e.target.files ?? [])));
            e.target.value = '';
          }}
        />
      </div>
      {error && (
        <p id={errorId} className="text-xs font-medium text-brick">
          {error}
        </p>
      )}
      {files.length > 0 && (
        <ul aria-label="Files to upload" className="divide-y divide-rule/70 rounded-lg border border-rule bg-card">
          {files.map((file, index) => (
            <li key={`${file.name}-${file.size}-${file.lastModified}`} className="flex items-center gap-4 px-4 py-2.5 text-sm">
              <span className="min-w-0 flex-1 truncate font-medium" title={file.name}>
                {file.name}
              </span>
              <span className="num w-20 text-right text-xs text-ink-soft">{formatBytes(file.size)}</span>
              {progress ? (
                <ProgressBar className="w-40" value={Math.round((progress[index] ?? 0) * 100)} label={`Upload of ${file.name}`} />
              ) : (
                <Button
                  variant="quiet"
                  size="sm"
                  disabled={disabled}
                  aria-label={`Remove ${file.name}`}
                  onClick={() => onChange(files.filter((_, i) => i !== index))}
                >
                  Remove
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
