import type { FlagCode, StructureResult } from '@shared/contracts/structure';
import { formatAngstrom } from '@/lib/format';

const TITLES: Record<FlagCode, string> = {
  'over-budget': 'Large displacement',
  'knife-edge': 'Group on a knife edge',
  'charge-multiplicity': 'Charge and multiplicity don’t fit',
  'close-contact': 'Atoms too close',
  'higher-symmetry': 'Higher symmetry than the input supports',
  'not-closed': 'Operations did not close into a group',
  'target-not-subgroup': 'Requested target not used',
};

/**
 * The caution for one flag: the engine's own sentence (result.flagNotes) where it has one, and
 * for the two results that could mislead a chemist the usual advice, with the numbers, so the
 * check is never left implicit.
 */
export function cautionText(flag: FlagCode, result: Pick<StructureResult, 'flagNotes' | 'maxDisplacement'>, budget: number): string[] {
  const note = result.flagNotes.find((n) => n.flag === flag)?.message;
  const lines = note ? [note] : [];
  if (flag === 'over-budget') {
    lines.push(
      `Snapping moved atoms by up to ${formatAngstrom(result.maxDisplacement)}, more than the budget of ${formatAngstrom(budget, 3)} — check that the structure is the one you meant.`,
    );
  } else if (flag === 'higher-symmetry') {
    lines.push('This may be a saddle point rather than a minimum — verify with a frequency calculation.');
  } else if (!note) {
    lines.push(TITLES[flag] + '.');
  }
  return lines;
}

/** The cautions that apply to this structure, most serious first, above everything else. */
export function Cautions({ result, budget }: { result: StructureResult; budget: number }) {
  if (result.flags.length === 0) return null;
  const order: FlagCode[] = ['over-budget', 'higher-symmetry', 'charge-multiplicity', 'close-contact', 'knife-edge', 'not-closed', 'target-not-subgroup'];
  const flags = [...result.flags].sort((a, b) => order.indexOf(a) - order.indexOf(b));
  return (
    <section aria-label="Cautions" className="flex flex-col gap-2">
      {flags.map((flag) => (
        <div key={flag} role="note" className="rounded-lg border border-ochre/40 bg-ochre-wash px-4 py-3">
          <p className="text-sm font-semibold text-ochre">{TITLES[flag]}</p>
          {cautionText(flag, result, budget).map((line) => (
            <p key={line} className="text-sm text-ink">
              {line}
            </p>
          ))}
        </div>
      ))}
    </section>
  );
}
