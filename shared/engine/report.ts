import type { LadderRungJson, StructureResult } from '../contracts/structure';
import { copyF64, f64 } from './arena';
import { snapSettingsSchema, type SnapSettings } from '../contracts/settings';
import type { MoleculeInput } from '../formats/types';
import { analyse, groupAt, type Analysis } from './analysis';
import { continuousSymmetryMeasure } from './csm';
import { cleanZeros, describe, equivalenceClasses, orientFit } from './describe';
import { EngineError } from './errors';
import { formatLength, perceptionNotes, type FlagNote } from './flag-notes';
import { toFrame, type FrameFit } from './fit-frame';
import { hillFormula } from './formula';
import { groupOrder } from './groups';
import { superpose } from './kabsch';
import { ladderRanges, type LadderRange } from './ladder';
import { apply3, identity3, mul3, mul33, transpose3, type Mat3 } from './mat3';
import { prepareMolecule } from './molecule';
import { symmetryRmsd } from './project';
import { computationalSubgroup } from './subgroups';
import { chooseTarget, fitFor, orderRank } from './targets';

/** Version string stamped on every result. */
export const ENGINE_VERSION = 'pointfold-engine 0.1.0';

/** Displacement RMSD and maximum (Å) of the snap onto `fit`, after optimal superposition. */
export function snapCost(a: Analysis, fit: FrameFit): { rmsd: number; max: number } {
  const s = superpose(a.mol.y, fit.W);
  return { rmsd: s.rmsd, max: largest(s.distances) };
}

/** The largest of some non-negative values (0 for none). */
function largest(values: readonly number[]): number {
  let m = 0;
  for (const v of values) if (v > m) m = v;
  return m;
}

/** Ladder JSON with snap costs (memoised per distinct group). */
export function ladderJson(a: Analysis, fits: Map<string, FrameFit>, ranges: readonly LadderRange[] = ladderRanges(a)): LadderRungJson[] {
  return ranges.map((r) => {
    // C1 leaves every atom where it is: nothing to fit or measure.
    const cost = r.found.name === 'C1' ? { rmsd: 0, max: 0 } : snapCost(a, fitFor(a, r.found, fits));
    return {
      group: r.found.name,
      order: r.found.order === 0 ? 0 : groupOrder(r.found.name),
      fromTolerance: r.from,
      toTolerance: r.to,
      displacementRmsd: cost.rmsd,
      maxDisplacement: cost.max,
    };
  });
}

const DEFAULT_SETTINGS = snapSettingsSchema.parse({});

/** Settings validated recently, by their JSON text: a batch passes the same settings every time. */
const parsedSettings = new Map<string, SnapSettings>();

function parseSettings(settings: Partial<SnapSettings> | undefined): SnapSettings {
  if (!settings || Object.keys(settings).length === 0) return DEFAULT_SETTINGS;
  const text = JSON.stringify(settings);
  const known = parsedSettings.get(text);
  if (known) return known;
  const parsed = snapSettingsSchema.safeParse(settings);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new EngineError('bad-settings', `settings.${issue.path.join('.')}: ${issue.message}`);
  }
  if (parsedSettings.size >= 32) parsedSettings.clear();
  parsedSettings.set(text, parsed.data);
  return parsed.data;
}

/**
 * The whole pipeline for one structure: perceive at `settings.tolerance`, build the ladder,
 * choose the target (`perceived`; `computational` = the D2h-type subgroup; or a named group that
 * is on the ladder or a subgroup of the perceived group — anything else keeps the perceived
 * group and raises 'target-not-subgroup'), fit its exact matrices, project (group average),
 * orient (`frame`: 'standard' or 'input'), measure and flag.
 * Charge and multiplicity: the molecule's, else the settings'; a null multiplicity becomes the
 * lowest one consistent with the electron count (1 for even, 2 for odd).
 * @throws EngineError for unusable input ('empty', 'bad-coordinates', 'unknown-element',
 * 'coincident-atoms', 'too-many-atoms'), an unknown target name ('unknown-group') or invalid
 * settings ('bad-settings').
 */
export function snap(molecule: MoleculeInput, settings?: Partial<SnapSettings>): StructureResult {
  const s = parseSettings(settings);
  const tol = s.tolerance;
  const mol = prepareMolecule(molecule.atoms);
  const a = analyse(mol, 2 * tol);
  const perceived = groupAt(a, tol);
  const fits = new Map<string, FrameFit>();
  const perceivedFit = orientFit(a, fitFor(a, perceived, fits));
  const ranges = ladderRanges(a);
  const ladder = ladderJson(a, fits, ranges);
  const target = chooseTarget(a, perceived, perceivedFit, ranges, s.target, fits);
  const chosen = target.fit === perceivedFit.fit ? perceivedFit : orientFit(a, target.fit);
  const { fit, S } = chosen;
  const name = fit.name;

  // Output coordinates.
  const n = mol.n;
  const standard = s.frame === 'standard';
  const R: Mat3 = standard ? mul3(S, transpose3(fit.Q)) : identity3();
  const toOut: Mat3 = standard ? identity3() : mul3(fit.Q, transpose3(S));
  const frameRot: Mat3 = standard ? S : fit.Q; // canonical → output
  // frameRot·W, as toFrame writes it (z = Qᵀw with Q = frameRotᵀ).
  const out = toFrame(fit.W, transpose3(frameRot));
  const centredOut = copyF64(out);
  if (!standard) for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) out[3 * i + d] += mol.centre[d];
  for (let i = 0; i < out.length; i++) if (Math.abs(out[i]) < 1e-11) out[i] = 0;
  const atoms = mol.symbols.map((element, i) => ({ element, x: out[3 * i], y: out[3 * i + 1], z: out[3 * i + 2] }));

  // Measures.
  const Qt = transpose3(fit.Q);
  const inputMats = fit.ideal.elements.map((e) => mul33(fit.Q, e.matrix, Qt));
  const outT = transpose3(frameRot);
  const outMats = fit.ideal.elements.map((e) => mul33(frameRot, e.matrix, outT));
  const symmetryRmsdBefore = symmetryRmsd(mol.y, inputMats, fit.perms);
  if (!standard) for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) centredOut[3 * i + d] = out[3 * i + d] - mol.centre[d];
  const symmetryRmsdAfter = symmetryRmsd(standard ? out : centredOut, outMats, fit.perms);
  const inputRaw = f64(3 * n);
  const [cx, cy, cz] = mol.centre;
  for (let i = 0; i < n; i++) {
    inputRaw[3 * i] = mol.y[3 * i] + cx;
    inputRaw[3 * i + 1] = mol.y[3 * i + 1] + cy;
    inputRaw[3 * i + 2] = mol.y[3 * i + 2] + cz;
  }
  const sup = superpose(inputRaw, out);
  const maxDisplacement = largest(sup.distances);
  const csm = continuousSymmetryMeasure(fit.Z, fit.W);
  const { operations, elements } = describe(chosen, toOut);
  const classes = equivalenceClasses(n, fit.perms);
  const comp =
    name === 'Kh' ? { name: 'D2h', alternatives: [] as string[] } : computationalSubgroup(fit.ideal, S);

  // Charge and multiplicity.
  const charge = molecule.charge ?? s.charge;
  let electrons = -charge;
  for (let i = 0; i < n; i++) electrons += mol.atomicNumbers[i];
  const multiplicity = molecule.multiplicity ?? s.multiplicity ?? (Math.abs(electrons) % 2 === 0 ? 1 : 2);

  // Flags.
  const notes: FlagNote[] = [];
  if (maxDisplacement > s.displacementBudget) {
    notes.push({
      flag: 'over-budget',
      message: `Snapping to ${name} moved an atom by ${formatLength(maxDisplacement)} Å, more than the displacement budget of ${formatLength(s.displacementBudget)} Å; check that this symmetry is intended.`,
    });
  }
  if (electrons < 0 || multiplicity - 1 > electrons || (multiplicity - 1) % 2 !== electrons % 2) {
    notes.push({
      flag: 'charge-multiplicity',
      message: `Charge ${charge} leaves ${electrons} electrons, which cannot be in a state of multiplicity ${multiplicity}.`,
    });
  }
  const higher = orderRank(name) > orderRank(perceived.name);
  if (higher || maxDisplacement > 3 * tol) {
    notes.push({
      flag: 'higher-symmetry',
      message: higher
        ? `${name} is more symmetric than the ${perceived.name} the input shows at ${formatLength(tol)} Å: the symmetric structure may be a saddle point rather than a minimum; verify with a frequency calculation.`
        : `Reaching ${name} moves atoms by up to ${formatLength(maxDisplacement)} Å, more than three times the tolerance: the symmetric structure may be a saddle point rather than a minimum; verify with a frequency calculation.`,
    });
  }
  notes.push(...perceptionNotes(a, perceived, tol));
  if (target.notAllowed) {
    notes.push({
      flag: 'target-not-subgroup',
      message: `The requested target ${target.notAllowed} is neither on the ladder nor a subgroup of ${perceived.name}; ${perceived.name} was kept.`,
    });
  }

  return {
    name: molecule.name,
    formula: hillFormula(mol.symbols),
    pointGroup: name,
    perceivedGroup: perceived.name,
    order: groupOrder(name),
    tolerance: tol,
    computationalSubgroup: comp.name,
    computationalSubgroupAlternatives: comp.alternatives,
    rotationalSymmetryNumber:
      name === 'C∞v' || name === 'Kh' ? 1 : name === 'D∞h' ? 2 : fit.ideal.elements.filter((e) => e.det > 0).length,
    symmetryRmsdBefore,
    symmetryRmsdAfter,
    displacementRmsd: sup.rmsd,
    maxDisplacement,
    csm,
    flags: notes.map((f) => f.flag),
    flagNotes: notes,
    charge,
    multiplicity,
    atoms,
    displacements: sup.distances,
    equivalenceClasses: classes,
    uniqueAtoms: classes.map((c) => c[0]),
    operations,
    elements,
    ladder,
    frame: s.frame,
    transform: {
      rotation: cleanZeros(R),
      translation: (standard ? apply3(R, mol.centre).map((v) => -v) : [0, 0, 0]) as [number, number, number],
    },
    engineVersion: ENGINE_VERSION,
  };
}
