import { outputFormats, type OutputFormat } from '@shared/contracts/settings';
import { buttonClass } from '@/components/ui/button';

const FORMAT_LABELS: Record<OutputFormat, { label: string; hint: string }> = {
  xyz: { label: 'XYZ', hint: 'coordinates with 10 decimals' },
  extxyz: { label: 'Extended XYZ', hint: 'with the group and charge in the comment line' },
  mol: { label: 'MDL molfile', hint: 'with bonds' },
  qcschema: { label: 'QCSchema JSON', hint: 'molecule with charge and multiplicity' },
  unique: { label: 'Unique atoms', hint: 'symmetry-unique atoms with the group' },
};

/** One plain link per format to GET /api/structures/:id/download?format=… (the session cookie authenticates). */
export function Downloads({ structureId }: { structureId: string }) {
  return (
    <section aria-labelledby="downloads-h" className="flex flex-col gap-2 rounded-lg border border-rule bg-card p-4">
      <h2 id="downloads-h" className="text-sm font-semibold text-ink">
        Download this structure
      </h2>
      <ul className="flex flex-col gap-1.5">
        {outputFormats.map((format) => (
          <li key={format} className="flex items-center justify-between gap-2">
            <a
              href={`/api/structures/${encodeURIComponent(structureId)}/download?format=${format}`}
              download
              className={buttonClass('secondary', 'sm')}
            >
              {FORMAT_LABELS[format].label}
            </a>
            <span className="text-right text-xs text-ink-faint">{FORMAT_LABELS[format].hint}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
