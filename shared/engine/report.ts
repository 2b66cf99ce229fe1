import type { FlagCode, LadderRungJson, OperationJson, StructureResult } from '../contracts/structure';
import { snapSettingsSchema, type SnapSettings } from '../contracts/settings';
import type { MoleculeInput } from '../formats/types';
import { analyse, groupAt, type Analysis, type FoundGroup } from './analysis';
import { continuousSymmetryMeasure } from './csm';
import { EngineError } from './errors';
import { fitGroup, fitSubgroup, type FrameFit } from './fit-frame';
import { hillFormula } from './formula';
import { groupOrder, parseGroupName, subgroupsOf } from './groups';
import { superpose } from './kabsch';
import { labelElements, type ElementLabel } from './labels';
import { ladderRanges } from './ladder';
import { apply3, canonicalDirection, identity3, mul3, transpose3, type Mat3, type Vec3 } from './mat3';
import { prepareMolecule } from './molecule';
import { standardOrientation } from './orient';
import { symmetryRmsd } from './project';
import { axisAlignmentScore, computationalSubgroup, subgroupsNamed } from './subgroups';

/** Version string stamped on every result. */
export const ENGINE_VERSION = 'pointfold-engine 0.1.0';

/** A fitted group put in its standard frame: what every report is built from. */
export interface OrientedFit {
  readonly fit: FrameFit;
  /** Canonical → standard frame rotation. */
  readonly S: Mat3;
  readonly labels: readonly ElementLabel[];
}

/** Fits a found group and orients it (see fit-frame.ts and orient.ts). */
export function orientFit(a: Analysis, fit: FrameFit): OrientedFit {
  // Orbits under the proper rotations only: atoms related by a rotation give the same frame.
  const orbitOf = new Int32Array(a.mol.n);
  const properPerms = fit.perms.filter((_, k) => fit.ideal.elements[k].det > 0);
  equivalenceClasses(a.mol.n, properPerms).forEach((c, k) => c.forEach((i) => (orbitOf[i] = k)));
  const rotations = fit.ideal.elements.filter((e) => e.det > 0).map((e) => e.matrix);
  const S = standardOrientation(fit.name, fit.W, a.mol, orbitOf, rotations);
  const labels = labelElements(fit.ideal.name, fit.ideal, S);
  return { fit, S, labels };
}

/** Infinite groups count as larger than every finite one. */
function orderRank(name: string): number {
  const o = groupOrder(name);
  return o === 0 ? Number.POSITIVE_INFINITY : o;
}

/** Orbits of atoms under the fitted group's permutations, each sorted, ordered by first atom. */
export function equivalenceClasses(n: number, perms: readonly Int32Array[]): number[][] {
  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  };
  for (const p of perms) {
    for (let i = 0; i < n; i++) {
      const a = find(i);
      const b = find(p[i]);
      if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
    }
  }
  const classes = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const r = find(i);
    const list = classes.get(r) ?? [];
    list.push(i);
    classes.set(r, list);
  }
  return [...classes.values()].sort((p, q) => p[0] - q[0]);
}

/**
 * Operations and symmetry elements of an oriented fit, expressed in the frame whose axes, seen
 * from the standard frame, are the rows of `toOut` (identity: standard frame; Sᵀ·Qᵀ: the
 * centred input frame). For C∞v and D∞h the operations are the C2v / D2h subset with the
 * infinite axis on z, and that axis is reported with order 0 (∞).
 */
export function describe(
  o: OrientedFit,
  toOut: Mat3,
): { operations: OperationJson[]; elements: StructureResult['elements'] } {
  const { fit, S, labels } = o;
  const St = transpose3(S);
  const outT = transpose3(toOut);
  const linear = fit.name === 'C∞v' || fit.name === 'D∞h';
  const operations: OperationJson[] = fit.ideal.elements.map((e, k) => {
    const std = mul3(mul3(S, e.matrix), St);
    const m = mul3(mul3(toOut, std), outT);
    const l = labels[k];
    const axis = l.kind === 'identity' || l.kind === 'inversion' ? ([0, 0, 0] as Vec3) : canonicalDirection(apply3(toOut, l.axis));
    return {
      symbol: l.symbol,
      kind: l.kind,
      order: l.order,
      power: l.power,
      axis: clean(axis) as [number, number, number],
      matrix: clean(m),
      permutation: Array.from(fit.perms[k]),
      residual: fit.residuals[k],
    };
  });
  const axes: StructureResult['elements']['axes'] = [];
  const planes: StructureResult['elements']['planes'] = [];
  const axisIndex = new Map<string, number>();
  const keyOf = (v: Vec3) => v.map((c) => Math.round(c * 1e6)).join(',');
  const rotations = labels.filter((l) => l.kind === 'rotation');
  const maxOrder = Math.max(0, ...rotations.map((l) => l.order));
  const maxAxes = new Set(rotations.filter((l) => l.order === maxOrder).map((l) => keyOf(l.axis)));
  const zKey = keyOf([0, 0, 1]);
  const principalKey = linear || (maxAxes.size > 1 && maxAxes.has(zKey) && maxOrder === 2) ? zKey : maxAxes.size === 1 ? [...maxAxes][0] : null;
  for (const l of labels) {
    if (l.kind === 'rotation') {
      const key = keyOf(l.axis);
      let idx = axisIndex.get(key);
      if (idx === undefined) {
        idx = axes.length;
        axisIndex.set(key, idx);
        axes.push({ order: 0, direction: [0, 0, 0], improperOrder: null, principal: key === principalKey });
        axes[idx].direction = clean(canonicalDirection(apply3(toOut, l.axis))) as [number, number, number];
      }
      axes[idx].order = Math.max(axes[idx].order, l.order);
    }
  }
  for (const l of labels) {
    if (l.kind === 'improper') {
      const idx = axisIndex.get(keyOf(l.axis));
      if (idx !== undefined) axes[idx].improperOrder = Math.max(axes[idx].improperOrder ?? 0, l.order);
    } else if (l.kind === 'reflection') {
      planes.push({ normal: clean(canonicalDirection(apply3(toOut, l.axis))) as [number, number, number], kind: l.planeKind ?? 'σ' });
    }
  }
  if (linear) {
    const idx = axisIndex.get(zKey);
    if (idx !== undefined) {
      axes[idx].order = 0;
      axes[idx].improperOrder = fit.name === 'D∞h' ? 0 : null;
    }
  }
  return { operations, elements: { axes, planes, inversionCentre: labels.some((l) => l.kind === 'inversion') } };
}

function clean(v: readonly number[]): number[] {
  return v.map((c) => (Math.abs(c) < 1e-14 ? 0 : c));
}

/** Displacement RMSD and maximum (Å) of the snap onto `fit`, after optimal superposition. */
export function snapCost(a: Analysis, fit: FrameFit): { rmsd: number; max: number } {
  const s = superpose(a.mol.y, fit.W);
  return { rmsd: s.rmsd, max: Math.max(0, ...s.distances) };
}

/** Ladder JSON with snap costs (memoised per distinct group). */
export function ladderJson(a: Analysis, fits: Map<string, FrameFit>): LadderRungJson[] {
  return ladderRanges(a).map((r) => {
    const fit = fitFor(a, r.found, fits);
    const cost = snapCost(a, fit);
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

function fitFor(a: Analysis, found: FoundGroup, fits: Map<string, FrameFit>): FrameFit {
  let f = fits.get(found.id);
  if (!f) {
    f = fitGroup(a, found);
    fits.set(found.id, f);
  }
  return f;
}

/** Names of the subgroups of a perceived group (for the linear groups: via their C2v/D2h stand-ins). */
export function subgroupNames(perceived: string): string[] {
  if (perceived === 'Kh') return ['Kh'];
  const names = new Set<string>([perceived]);
  if (perceived === 'D∞h') names.add('C∞v');
  const finite = perceived === 'D∞h' ? 'D2h' : perceived === 'C∞v' ? 'C2v' : perceived;
  for (const s of subgroupsOf(finite)) names.add(s.name);
  return [...names];
}

/** Sorts group names by order, highest first (∞ first), then by name. */
export function byOrderDesc(names: Iterable<string>): string[] {
  return [...new Set(names)].sort((p, q) => orderRank(q) - orderRank(p) || p.localeCompare(q));
}

/**
 * Groups a structure may be snapped to: the groups on its ladder and the subgroups of its
 * perceived group, highest order first.
 */
export function allowedTargets(result: Pick<StructureResult, 'perceivedGroup' | 'ladder'>): string[] {
  return byOrderDesc([...result.ladder.map((r) => r.group), ...subgroupNames(result.perceivedGroup)]);
}

interface Target {
  fit: FrameFit;
  found: FoundGroup | null;
  notAllowed: string | null;
}

/** Picks and fits the target group (see {@link snap}). */
function chooseTarget(
  a: Analysis,
  perceived: FoundGroup,
  perceivedFit: OrientedFit,
  ranges: { found: FoundGroup }[],
  policy: SnapSettings['target'],
  fits: Map<string, FrameFit>,
): Target {
  const y = a.mol.y;
  if (policy.kind === 'perceived') return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
  if (perceived.name === 'Kh') {
    const name = policy.kind === 'group' ? parseGroupName(policy.group) : null;
    return { fit: perceivedFit.fit, found: perceived, notAllowed: policy.kind === 'group' && name !== 'Kh' ? policy.group : null };
  }
  if (policy.kind === 'computational') {
    const sub = computationalSubgroup(perceivedFit.fit.ideal, perceivedFit.S);
    if (sub.name === perceivedFit.fit.name) return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
    return { fit: fitSubgroup(y, perceivedFit.fit, sub.members, sub.name), found: null, notAllowed: null };
  }
  const name = parseGroupName(policy.group);
  if (!name) throw new EngineError('unknown-group', `target '${policy.group}' is not a point group name`);
  if (name === perceived.name) return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
  const rung = ranges.find((r) => r.found.name === name);
  if (rung) return { fit: fitFor(a, rung.found, fits), found: rung.found, notAllowed: null };
  if (name === 'C∞v' && perceived.name === 'D∞h') {
    const found: FoundGroup = { name, order: 0, tolerance: perceived.tolerance, elements: [], notClosed: false, id: name };
    return { fit: fitGroup(a, found), found, notAllowed: null };
  }
  const parentName = perceivedFit.fit.ideal.name;
  const candidates = subgroupsNamed(parentName, name);
  if (candidates.length === 0) return { fit: perceivedFit.fit, found: perceived, notAllowed: name };
  let best: { fit: FrameFit; cost: number; score: number[] } | null = null;
  for (const members of candidates) {
    const fit = fitSubgroup(y, perceivedFit.fit, members, name);
    let cost = 0;
    for (let i = 0; i < fit.W.length; i++) cost += (fit.Z[i] - fit.W[i]) ** 2;
    const score = axisAlignmentScore(parentName, members, perceivedFit.S);
    const better =
      !best ||
      cost < best.cost - 1e-9 * (1 + best.cost) ||
      (Math.abs(cost - best.cost) <= 1e-9 * (1 + best.cost) && compare(score, best.score) > 0);
    if (better) best = { fit, cost, score };
  }
  return { fit: best!.fit, found: null, notAllowed: null };
}

function compare(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] - b[i];
  return 0;
}

function fmt(x: number): string {
  return x === 0 ? '0' : x < 1e-3 ? x.toExponential(1) : String(Number(x.toPrecision(2)));
}

const DEFAULT_SETTINGS = snapSettingsSchema.parse({});

function parseSettings(settings: Partial<SnapSettings> | undefined): SnapSettings {
  if (!settings || Object.keys(settings).length === 0) return DEFAULT_SETTINGS;
  const parsed = snapSettingsSchema.safeParse(settings);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new EngineError('bad-settings', `settings.${issue.path.join('.')}: ${issue.message}`);
  }
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
  const ladder = ladderJson(a, fits);
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
  const out = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const w = [fit.W[3 * i], fit.W[3 * i + 1], fit.W[3 * i + 2]];
    const v = apply3(frameRot, w);
    for (let d = 0; d < 3; d++) out[3 * i + d] = v[d];
  }
  const centredOut = out.slice();
  if (!standard) for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) out[3 * i + d] += mol.centre[d];
  for (let i = 0; i < out.length; i++) if (Math.abs(out[i]) < 1e-11) out[i] = 0;
  const atoms = mol.symbols.map((element, i) => ({ element, x: out[3 * i], y: out[3 * i + 1], z: out[3 * i + 2] }));

  // Measures.
  const Qt = transpose3(fit.Q);
  const inputMats = fit.ideal.elements.map((e) => mul3(mul3(fit.Q, e.matrix), Qt));
  const outT = transpose3(frameRot);
  const outMats = fit.ideal.elements.map((e) => mul3(mul3(frameRot, e.matrix), outT));
  const symmetryRmsdBefore = symmetryRmsd(mol.y, inputMats, fit.perms);
  if (!standard) for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) centredOut[3 * i + d] = out[3 * i + d] - mol.centre[d];
  const symmetryRmsdAfter = symmetryRmsd(standard ? out : centredOut, outMats, fit.perms);
  const inputRaw = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) inputRaw[3 * i + d] = mol.y[3 * i + d] + mol.centre[d];
  const sup = superpose(inputRaw, out);
  const maxDisplacement = Math.max(0, ...sup.distances);
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
  const flags: FlagCode[] = [];
  const notes: { flag: FlagCode; message: string }[] = [];
  const flag = (f: FlagCode, message: string) => {
    flags.push(f);
    notes.push({ flag: f, message });
  };
  if (maxDisplacement > s.displacementBudget) {
    flag(
      'over-budget',
      `Snapping to ${name} moved an atom by ${fmt(maxDisplacement)} Å, more than the displacement budget of ${fmt(s.displacementBudget)} Å; check that this symmetry is intended.`,
    );
  }
  const half = groupAt(a, tol / 2).name;
  const twice = groupAt(a, tol * 2).name;
  if (half !== perceived.name || twice !== perceived.name) {
    flag(
      'knife-edge',
      `The perceived group depends on the tolerance: ${half} at ${fmt(tol / 2)} Å, ${perceived.name} at ${fmt(tol)} Å, ${twice} at ${fmt(2 * tol)} Å.`,
    );
  }
  if (electrons < 0 || multiplicity - 1 > electrons || (multiplicity - 1) % 2 !== electrons % 2) {
    flag(
      'charge-multiplicity',
      `Charge ${charge} leaves ${electrons} electrons, which cannot be in a state of multiplicity ${multiplicity}.`,
    );
  }
  if (mol.closeContact) {
    const c = mol.closeContact;
    flag('close-contact', `Atoms ${c.i + 1} and ${c.j + 1} are only ${fmt(c.distance)} Å apart.`);
  }
  const higher = orderRank(name) > orderRank(perceived.name);
  if (higher || maxDisplacement > 3 * tol) {
    flag(
      'higher-symmetry',
      higher
        ? `${name} is more symmetric than the ${perceived.name} the input shows at ${fmt(tol)} Å: the symmetric structure may be a saddle point rather than a minimum; verify with a frequency calculation.`
        : `Reaching ${name} moves atoms by up to ${fmt(maxDisplacement)} Å, more than three times the tolerance: the symmetric structure may be a saddle point rather than a minimum; verify with a frequency calculation.`,
    );
  }
  if (perceived.notClosed) {
    flag(
      'not-closed',
      `Some operations found within ${fmt(tol)} Å do not combine into a group; the largest closed group, ${perceived.name}, was used.`,
    );
  }
  if (target.notAllowed) {
    flag(
      'target-not-subgroup',
      `The requested target ${target.notAllowed} is neither on the ladder nor a subgroup of ${perceived.name}; ${perceived.name} was kept.`,
    );
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
    flags,
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
      rotation: clean(R),
      translation: (standard ? apply3(R, mol.centre).map((v) => -v) : [0, 0, 0]) as [number, number, number],
    },
    engineVersion: ENGINE_VERSION,
  };
}
