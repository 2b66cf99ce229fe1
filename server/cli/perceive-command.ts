import { ladder, perceive } from '@shared/engine';
import { hillFormula } from '@shared/engine/formula';
import { eachStructure, type LoadedStructure } from './each-structure';
import { streamInputs } from './load-inputs';
import { EXIT_OK, UsageError, integerOption, lengthOption, parseCommandArgs } from './options';
import { BufferedOut, formatLength, formatOrder, renderTable } from './output';

export const PERCEIVE_HELP = `Usage: pointfold perceive FILE... [options]

Perceive each structure's point group within a tolerance, without changing it: the
operations found (with residuals), the symmetry elements and the classes of equivalent atoms.
FILE: XYZ, extended XYZ, molfile/SD, PDB, CML, QCSchema JSON, or a ZIP of these.

Options:
  --tolerance Å     largest distance between an atom's image and the nearest atom of the
                    same element (default 0.01)
  --max-atoms N     largest structure accepted (default 20000)
  --json            print {"structures": [...]} on stdout, one entry per structure
  -h, --help        this text

Exit status: 0 all done; 1 bad input (one line per problem on stderr; the other structures are
still processed); 2 usage error.`;

export const LADDER_HELP = `Usage: pointfold ladder FILE... [options]

For each structure, the point group perceived at each tolerance from 1e-4 to 0.3 Å, merged
into ranges, with what snapping to each group would cost (displacement RMS and maximum).
A group that holds only over a narrow range sits on a knife edge.

Options:
  --max-atoms N     largest structure accepted (default 20000)
  --json            print {"structures": [...]} on stdout, one entry per structure
  -h, --help        this text

Exit status: 0 all done; 1 bad input; 2 usage error.`;

type Analyse = (item: LoadedStructure) => Record<string, unknown>;

/** The shared loop of perceive and ladder: read, analyse each structure, report in input order. */
async function runEach(command: string, argv: string[], withTolerance: boolean, help: string, analyse: (tolerance: number | undefined) => Analyse, text: (entries: Record<string, unknown>[]) => string): Promise<number> {
  const { values, positionals } = parseCommandArgs(command, argv, {
    ...(withTolerance ? { tolerance: { type: 'string' as const } } : {}),
    'max-atoms': { type: 'string' },
    json: { type: 'boolean' },
    help: { type: 'boolean', short: 'h' },
  });
  if (values.help) {
    process.stdout.write(`${help}\n`);
    return EXIT_OK;
  }
  if (positionals.length === 0) throw new UsageError(`pointfold ${command}: give at least one FILE (see pointfold ${command} --help)`);
  const tolerance = lengthOption(command, 'tolerance', (values as { tolerance?: string }).tolerance, 1);
  const maxAtoms = integerOption(command, 'max-atoms', values['max-atoms'] as string | undefined, 1, 1_000_000);
  const items = streamInputs(positionals, { maxAtoms });
  const fn = analyse(tolerance);
  const out = new BufferedOut();
  const { status, outcomes } = await eachStructure(command, items, Boolean(values.json), out, (item) => {
    const m = item.molecule;
    return { name: m.name, inputFile: m.sourceFile, frameIndex: m.frameIndex, formula: hillFormula(m.atoms.map((a) => a.element)), ...fn(item) };
  });
  if (!values.json) out.write(`${text(outcomes.map((o) => o.entry))}\n`);
  out.flush();
  return status;
}

const clip = (name: unknown) => {
  const s = String(name);
  return s.length > 40 ? `${s.slice(0, 39)}…` : s;
};

/** Run `pointfold perceive`. Returns the exit status. */
export function runPerceive(argv: string[]): Promise<number> {
  return runEach(
    'perceive',
    argv,
    true,
    PERCEIVE_HELP,
    (tolerance) => (item) => ({ ...perceive(item.molecule.atoms, tolerance == null ? {} : { tolerance }) }),
    (entries) => {
      const table = renderTable(
        [
          { header: 'Structure' },
          { header: 'Formula' },
          { header: 'Group' },
          { header: 'Order', right: true },
          { header: 'Tolerance', right: true },
          { header: 'Classes', right: true },
          { header: 'Worst residual', right: true },
          { header: 'Flags' },
        ],
        entries.map((e) => {
          if (e.error != null) return [clip(e.name), '', '—', '', '', '', '', 'failed (see the message above)'];
          const ops = (e.operations as { residual: number }[]) ?? [];
          const worst = ops.reduce((w, op) => Math.max(w, op.residual), 0);
          return [
            clip(e.name),
            String(e.formula),
            String(e.pointGroup),
            formatOrder(e.order as number),
            formatLength(e.tolerance as number),
            String((e.equivalenceClasses as unknown[]).length),
            formatLength(worst),
            ((e.flags as string[]) ?? []).join(', '),
          ];
        }),
      );
      const notes = entries.flatMap((e) => ((e.flagNotes as { message: string }[] | undefined) ?? []).map((n) => `  ${clip(e.name)}: ${n.message}`));
      return [table, '', 'Lengths in Å. Worst residual: the largest distance of an atom image from its partner over the operations found.', ...(notes.length ? ['', 'Cautions:', ...notes] : [])].join('\n');
    },
  );
}

/** Run `pointfold ladder`. Returns the exit status. */
export function runLadder(argv: string[]): Promise<number> {
  return runEach(
    'ladder',
    argv,
    false,
    LADDER_HELP,
    () => (item) => ({ ladder: ladder(item.molecule.atoms) }),
    (entries) =>
      entries
        .map((e) => {
          if (e.error != null) return `${e.name}: failed (see the message above)`;
          const rungs = e.ladder as { group: string; order: number; fromTolerance: number; toTolerance: number; displacementRmsd: number; maxDisplacement: number }[];
          const table = renderTable(
            [
              { header: 'Tolerance from', right: true },
              { header: 'to', right: true },
              { header: 'Group' },
              { header: 'Order', right: true },
              { header: 'Snap moves RMS', right: true },
              { header: 'max', right: true },
            ],
            rungs.map((r) => [formatLength(r.fromTolerance), formatLength(r.toTolerance), r.group, formatOrder(r.order), formatLength(r.displacementRmsd), formatLength(r.maxDisplacement)]),
          );
          return `${e.name} (${e.formula})\n${table}`;
        })
        .join('\n\n') + '\n\nLengths in Å.',
  );
}
