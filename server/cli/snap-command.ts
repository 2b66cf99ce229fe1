import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { outputFormats, snapSettingsSchema, type OutputFormat, type SnapSettings, type TargetPolicy } from '@shared/contracts/settings';
import type { StructureResult } from '@shared/contracts/structure';
import { parseGroupName, snap } from '@shared/engine';
import { OUTPUT_EXTENSIONS, outputFileName, verifyWritten, writeStructure } from '@shared/formats/write';
import { eachStructure } from './each-structure';
import { streamInputs } from './load-inputs';
import { EXIT_OK, UsageError, integerOption, lengthOption, parseCommandArgs } from './options';
import { BufferedOut, formatCsm, formatLength, formatOrder, renderTable } from './output';

export const SNAP_HELP = `Usage: pointfold snap FILE... [options]

Perceive each structure's point group, snap it onto exact symmetry (group average),
put it in the standard frame and report how far atoms moved.
FILE: XYZ, extended XYZ, molfile/SD, PDB, CML, QCSchema JSON, or a ZIP of these.

Options:
  --tolerance Å        perception tolerance (default 0.01)
  --target GROUP       perceived (default), computational, or a point group such as C2v
                       (a group on the ladder or a subgroup of the perceived one)
  --frame standard|input
                       standard frame (default) or keep the input frame
  --budget Å           displacement budget; atoms moving more are flagged (default 0.05)
  --charge N           charge for files that carry none (default 0)
  --multiplicity N     multiplicity for files that carry none (default: lowest
                       consistent with the electron count)
  --out DIR            write the snapped structures to DIR; each file is read back
                       and re-perceived to prove the symmetry survived its digits
  --format LIST        formats for --out, comma-separated: xyz, extxyz, mol, qcschema,
                       unique (default xyz,qcschema)
  --max-atoms N        largest structure accepted (default 20000)
  --json               print {"structures": [...]} on stdout, one entry per structure
                       in input order (a failed one: name, inputFile, frameIndex, error)
  -h, --help           this text

Exit status: 0 all done; 1 bad input (reported on stderr as file:line: frame N: message;
the other structures are still processed); 2 usage error.
A snapped geometry is not a re-optimized one: confirm the symmetry of anything you rely on
with a frequency calculation at your own level of theory.`;

function targetOf(raw: string | undefined): TargetPolicy {
  if (raw == null) return { kind: 'perceived' };
  const t = raw.trim().toLowerCase();
  if (t === 'perceived' || t === 'computational') return { kind: t };
  const group = parseGroupName(raw);
  if (group == null) throw new UsageError(`pointfold snap: --target '${raw}' is not a point group (examples: C2v, D3h, Td)`);
  return { kind: 'group', group };
}

function formatsOf(raw: string[] | undefined): OutputFormat[] | undefined {
  if (raw == null) return undefined;
  const list = raw.flatMap((r) => r.split(',')).map((s) => s.trim().toLowerCase()).filter(Boolean);
  for (const f of list) {
    if (!(outputFormats as readonly string[]).includes(f)) {
      throw new UsageError(`pointfold snap: --format '${f}' is not one of ${outputFormats.join(', ')}`);
    }
  }
  return [...new Set(list)] as OutputFormat[];
}

/** Run `pointfold snap`. Returns the exit status. */
export async function runSnap(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs('snap', argv, {
    tolerance: { type: 'string' },
    target: { type: 'string' },
    frame: { type: 'string' },
    budget: { type: 'string' },
    charge: { type: 'string' },
    multiplicity: { type: 'string' },
    out: { type: 'string' },
    format: { type: 'string', multiple: true },
    'max-atoms': { type: 'string' },
    json: { type: 'boolean' },
    help: { type: 'boolean', short: 'h' },
  });
  if (values.help) {
    process.stdout.write(`${SNAP_HELP}\n`);
    return EXIT_OK;
  }
  if (positionals.length === 0) throw new UsageError('pointfold snap: give at least one FILE (see pointfold snap --help)');
  if (values.frame != null && values.frame !== 'standard' && values.frame !== 'input') {
    throw new UsageError(`pointfold snap: --frame must be standard or input (got '${values.frame}')`);
  }
  const formats = formatsOf(values.format);
  if (formats != null && values.out == null) throw new UsageError('pointfold snap: --format needs --out DIR');
  const parsed = snapSettingsSchema.safeParse({
    tolerance: lengthOption('snap', 'tolerance', values.tolerance, 1),
    target: targetOf(values.target),
    frame: values.frame,
    displacementBudget: lengthOption('snap', 'budget', values.budget, 5),
    charge: integerOption('snap', 'charge', values.charge, -20, 20),
    multiplicity: integerOption('snap', 'multiplicity', values.multiplicity, 1, 20) ?? null,
    outputFormats: formats,
  });
  if (!parsed.success) throw new UsageError(`pointfold snap: ${parsed.error.issues[0]?.message ?? 'bad settings'}`);
  const settings: SnapSettings = parsed.data;
  const maxAtoms = integerOption('snap', 'max-atoms', values['max-atoms'], 1, 1_000_000);

  // Output file names number the frames of a file, so with --out each file is counted first.
  const items = streamInputs(positionals, { maxAtoms, frameCounts: values.out != null });
  const out = new BufferedOut();
  const usedNames = new Set<string>();
  if (values.out != null) mkdirSync(values.out, { recursive: true });
  const { status, outcomes } = await eachStructure('snap', items, Boolean(values.json), out, (item) => {
    const m = item.molecule;
    const result = snap(m, settings);
    const entry: Record<string, unknown> = { ...result, inputFile: m.sourceFile, frameIndex: m.frameIndex };
    if (values.out != null) {
      // Every format is written and checked before any file is saved: all or nothing.
      const texts = settings.outputFormats.map((format) => {
        const text = writeStructure(format, result);
        verifyWritten(format, text, result);
        return { format, text };
      });
      const written: string[] = [];
      for (const { format, text } of texts) {
        const first = outputFileName(m.sourceFile, m.frameIndex, item.frameCount, format);
        const ext = OUTPUT_EXTENSIONS[format];
        let fileName = first;
        // Two inputs with the same base name (a/x.xyz, b/x.xyz): x.xyz, then x_2.xyz.
        for (let n = 2; usedNames.has(fileName); n++) fileName = `${first.slice(0, -ext.length)}_${n}${ext}`;
        usedNames.add(fileName);
        writeFileSync(join(values.out, fileName), text);
        written.push(fileName);
      }
      entry.outputFiles = written;
    }
    return entry;
  });
  if (!values.json) {
    const rows = outcomes.map(({ entry, failure }) =>
      failure == null ? { result: entry as unknown as StructureResult, name: String(entry.name) } : { name: String(entry.name), error: failure },
    );
    out.write(`${snapTable(rows)}\n`);
  }
  out.flush();
  return status;
}

function snapTable(rows: { result?: StructureResult; name: string; error?: string }[]): string {
  const table = renderTable(
    [
      { header: 'Structure' },
      { header: 'Formula' },
      { header: 'Group' },
      { header: 'Order', right: true },
      { header: 'Subgroup' },
      { header: 'RMSD before', right: true },
      { header: 'RMSD after', right: true },
      { header: 'Moved RMS', right: true },
      { header: 'Moved max', right: true },
      { header: 'CSM', right: true },
      { header: 'Flags' },
    ],
    rows.map(({ result: r, name }) =>
      r
        ? [
            clip(name),
            r.formula,
            r.pointGroup,
            formatOrder(r.order),
            r.computationalSubgroup,
            formatLength(r.symmetryRmsdBefore),
            formatLength(r.symmetryRmsdAfter),
            formatLength(r.displacementRmsd),
            formatLength(r.maxDisplacement),
            formatCsm(r.csm),
            r.flags.join(', '),
          ]
        : [clip(name), '', '—', '', '', '', '', '', '', '', 'failed (see the message above)'],
    ),
  );
  const done = rows.filter((r) => r.result).length;
  const lines = [table, '', `${rows.length} structure${rows.length === 1 ? '' : 's'}: ${done} snapped, ${rows.length - done} failed. Lengths in Å.`];
  const flagged = rows.filter((r) => r.result && r.result.flagNotes.length > 0);
  if (flagged.length > 0) {
    lines.push('', 'Cautions:');
    for (const { result } of flagged) for (const note of result!.flagNotes) lines.push(`  ${clip(result!.name)}: ${note.message}`);
    lines.push(
      '',
      'A snapped geometry is not a re-optimized one: where a structure is flagged, confirm its symmetry',
      'with a frequency calculation at your own level of theory before relying on it.',
    );
  }
  return lines.join('\n');
}

function clip(name: string): string {
  return name.length > 40 ? `${name.slice(0, 39)}…` : name;
}
