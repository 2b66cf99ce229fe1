import { Spinner } from '@/components/ui/spinner';
import { ErrorState } from '@/components/ui/states';
import { Badge } from '@/components/ui/badge';
import { formatCount, plural } from '@/lib/format';
import type { BatchPreview } from '../api/preview-batch';

/** What the server recognised in the chosen files, before anything is stored. */
export function PreviewPanel({ preview, pending, error }: { preview: BatchPreview | undefined; pending: boolean; error: string | null }) {
  if (pending) return <Spinner label="Reading the files" />;
  if (error) return <ErrorState title="The files could not be checked" message={error} />;
  if (!preview) return null;

  const structures = Array.isArray(preview.structures) ? preview.structures.length : (preview.structures ?? sum(preview.files.map((f) => f.structures ?? 0)));
  const frames = preview.frames ?? sum(preview.files.map((f) => f.frames ?? 0));
  const formats = preview.formats ?? countFormats(preview.files.map((f) => f.format ?? null));

  return (
    <section aria-label="What was recognised" className="rounded-lg border border-rule bg-card px-5 py-4 text-sm">
      <h3 className="font-semibold">Recognised</h3>
      <p className="mt-1 text-ink-soft">
        <span className="num text-ink">{formatCount(structures)}</span> {structures === 1 ? 'structure' : 'structures'} in{' '}
        <span className="num text-ink">{formatCount(frames)}</span> {frames === 1 ? 'frame' : 'frames'}
        {preview.files.length > 0 && <> from {plural(preview.files.length, 'file')}</>}
        {preview.atoms !== undefined && (
          <>
            {' '}
            · <span className="num text-ink">{formatCount(preview.atoms)}</span> atoms
          </>
        )}
      </p>
      {Object.keys(formats).length > 0 && (
        <ul aria-label="Formats" className="mt-2 flex flex-wrap gap-1.5">
          {Object.entries(formats).map(([format, count]) => (
            <li key={format}>
              <Badge tone="lapis">
                {format} <span className="num">×{count}</span>
              </Badge>
            </li>
          ))}
        </ul>
      )}
      {preview.errors.length > 0 && (
        <div className="mt-3">
          <h4 className="font-medium text-brick">{plural(preview.errors.length, 'problem')} — these parts will be skipped, the rest goes on</h4>
          <ul className="mt-1 max-h-48 list-disc overflow-auto pl-5 text-ink">
            {preview.errors.map((e, i) => (
              <li key={i}>{describeProblem(e)}</li>
            ))}
          </ul>
        </div>
      )}
      {structures === 0 && preview.errors.length === 0 && <p className="mt-2 text-ochre">No structures were found in these files.</p>}
    </section>
  );
}

/** "file, frame n, line m: message", unless the message already says where (the parser's messages do). */
export function describeProblem(e: BatchPreview['errors'][number]): string {
  if (e.file && e.message.includes(e.file)) return e.message;
  const where = [e.file, e.frame != null ? `frame ${e.frame + 1}` : null, e.line != null ? `line ${e.line}` : null].filter(Boolean).join(', ');
  return where ? `${where}: ${e.message}` : e.message;
}

function sum(values: number[]): number {
  return values.reduce((a, b) => a + b, 0);
}

function countFormats(formats: Array<string | null>): Record<string, number> {
  const out: Record<string, number> = {};
  for (const f of formats) if (f) out[f] = (out[f] ?? 0) + 1;
  return out;
}
