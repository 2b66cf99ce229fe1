import type { AtomJson, OperationJson } from '../contracts/structure';
import { atomicWeight } from '../elements';
import { fixed, XYZ_DECIMALS } from './xyz';

/**
 * The "unique atoms" format: Pointfold's own small text format (version 1) holding the
 * symmetry-unique atoms of a snapped structure with its point group, enough to rebuild the whole
 * structure. Lines (`#` starts a comment line; keys are lower case, one `key: value` per line):
 *
 * ```
 * # pointfold-unique 1
 * name: water, optimized
 * point-group: C2v
 * computational-subgroup: C2v
 * frame: standard                        (standard | input)
 * charge: 0
 * multiplicity: 1
 * atoms: 3                               (atoms in the whole structure)
 * centre: 0.0 0.0 0.0                    (centre of mass, Å; the operations act about it)
 * operations: 4                          (then one line per operation)
 * op E 1 0 0 0 1 0 0 0 1                 (symbol, row-major 3×3 matrix in the written frame)
 * …
 * unique-atoms: 2
 * # index element x y z class-size       (index: 1-based in the input's atom order; Å)
 * atom 1 O 0.000000000000 0.000000000000 -0.065775570547 1
 * atom 2 H 0.000000000000 0.759061990794 0.521953018286 2
 * end
 * ```
 *
 * Rebuild: apply every operation x' = c + M (x − c) to every unique atom and keep the distinct
 * images (distinct at 1e-6 Å); each unique atom yields `class-size` atoms. Coordinates have 12
 * decimals. The order of the rebuilt atoms is not the input order.
 */

/** A parsed unique-atoms file. */
export interface UniqueAtomsFile {
  name: string;
  pointGroup: string;
  computationalSubgroup: string;
  frame: string;
  charge: number;
  multiplicity: number;
  atomCount: number;
  centre: [number, number, number];
  operations: { symbol: string; matrix: number[] }[];
  unique: { index: number; element: string; x: number; y: number; z: number; classSize: number }[];
}

/** What {@link writeUniqueAtoms} needs from a snap result. */
export interface UniqueAtomsInput {
  name: string;
  pointGroup: string;
  computationalSubgroup: string;
  frame: string;
  charge: number;
  multiplicity: number;
  atoms: readonly AtomJson[];
  operations: readonly Pick<OperationJson, 'symbol' | 'matrix'>[];
  equivalenceClasses: readonly (readonly number[])[];
  uniqueAtoms: readonly number[];
}

/** Mass-weighted centre (IUPAC 2021 standard atomic weights), Å. */
export function centreOfMass(atoms: readonly AtomJson[]): [number, number, number] {
  let m = 0;
  const c: [number, number, number] = [0, 0, 0];
  for (const a of atoms) {
    const w = atomicWeight(a.element);
    m += w;
    c[0] += w * a.x;
    c[1] += w * a.y;
    c[2] += w * a.z;
  }
  return [c[0] / m, c[1] / m, c[2] / m];
}

const num = (v: number) => fixed(v, XYZ_DECIMALS);

/** Write the unique-atoms format (see the module comment). */
export function writeUniqueAtoms(r: UniqueAtomsInput): string {
  const classOf = new Map<number, number>();
  r.equivalenceClasses.forEach((cls) => cls.forEach((i) => classOf.set(i, cls.length)));
  const centre = centreOfMass(r.atoms);
  const lines = [
    '# pointfold-unique 1',
    `name: ${r.name.replace(/[\r\n]+/g, ' ')}`,
    `point-group: ${r.pointGroup}`,
    `computational-subgroup: ${r.computationalSubgroup}`,
    `frame: ${r.frame}`,
    `charge: ${r.charge}`,
    `multiplicity: ${r.multiplicity}`,
    `atoms: ${r.atoms.length}`,
    `centre: ${centre.map(num).join(' ')}`,
    `operations: ${r.operations.length}`,
    ...r.operations.map((op) => `op ${op.symbol.replace(/\s+/g, '')} ${op.matrix.map(num).join(' ')}`),
    `unique-atoms: ${r.uniqueAtoms.length}`,
    '# index element x y z class-size',
    ...r.uniqueAtoms.map((i) => {
      const a = r.atoms[i];
      return `atom ${i + 1} ${a.element} ${num(a.x)} ${num(a.y)} ${num(a.z)} ${classOf.get(i) ?? 1}`;
    }),
    'end',
  ];
  return `${lines.join('\n')}\n`;
}

/**
 * Parse the unique-atoms format.
 * @throws Error with a one-line message naming the line, for anything malformed.
 */
export function readUniqueAtoms(text: string): UniqueAtomsFile {
  const header = new Map<string, string>();
  const operations: UniqueAtomsFile['operations'] = [];
  const unique: UniqueAtomsFile['unique'] = [];
  const lines = text.split(/\r?\n/);
  if (lines[0]?.trim() !== '# pointfold-unique 1') throw new Error('line 1: not a pointfold-unique 1 file');
  lines.forEach((line, k) => {
    const t = line.trim();
    if (t === '' || t.startsWith('#') || t === 'end') return;
    const bad = () => new Error(`line ${k + 1}: cannot read ${JSON.stringify(t.slice(0, 40))}`);
    if (t.startsWith('op ')) {
      const p = t.split(/\s+/);
      const m = p.slice(2).map(Number);
      if (m.length !== 9 || m.some((v) => !Number.isFinite(v))) throw bad();
      operations.push({ symbol: p[1], matrix: m });
    } else if (t.startsWith('atom ')) {
      const p = t.split(/\s+/);
      const [index, x, y, z, size] = [p[1], p[3], p[4], p[5], p[6]].map(Number);
      if (p.length !== 7 || ![index, x, y, z, size].every(Number.isFinite)) throw bad();
      unique.push({ index, element: p[2], x, y, z, classSize: size });
    } else {
      const i = t.indexOf(':');
      if (i < 0) throw bad();
      header.set(t.slice(0, i).trim(), t.slice(i + 1).trim());
    }
  });
  const need = (k: string) => {
    const v = header.get(k);
    if (v == null) throw new Error(`missing '${k}:' line`);
    return v;
  };
  const centre = need('centre').split(/\s+/).map(Number);
  if (centre.length !== 3 || centre.some((v) => !Number.isFinite(v))) throw new Error('bad centre line');
  const file: UniqueAtomsFile = {
    name: header.get('name') ?? '',
    pointGroup: need('point-group'),
    computationalSubgroup: need('computational-subgroup'),
    frame: need('frame'),
    charge: Number(need('charge')),
    multiplicity: Number(need('multiplicity')),
    atomCount: Number(need('atoms')),
    centre: centre as [number, number, number],
    operations,
    unique,
  };
  if (Number(need('operations')) !== operations.length) throw new Error(`'operations: ${need('operations')}' but ${operations.length} op lines`);
  if (Number(need('unique-atoms')) !== unique.length) throw new Error(`'unique-atoms: ${need('unique-atoms')}' but ${unique.length} atom lines`);
  return file;
}

/**
 * Rebuild the whole structure from a unique-atoms file: every operation applied to every unique
 * atom, images closer than `tolerance` Å (default 1e-6) merged. Atom order: class by class.
 */
export function expandUniqueAtoms(f: UniqueAtomsFile, tolerance = 1e-6): { atoms: AtomJson[]; classSizes: number[] } {
  const [cx, cy, cz] = f.centre;
  const atoms: AtomJson[] = [];
  const classSizes: number[] = [];
  for (const u of f.unique) {
    const images: AtomJson[] = [];
    const dx = u.x - cx;
    const dy = u.y - cy;
    const dz = u.z - cz;
    for (const { matrix: m } of f.operations) {
      const p = {
        element: u.element,
        x: cx + m[0] * dx + m[1] * dy + m[2] * dz,
        y: cy + m[3] * dx + m[4] * dy + m[5] * dz,
        z: cz + m[6] * dx + m[7] * dy + m[8] * dz,
      };
      if (!images.some((q) => Math.hypot(q.x - p.x, q.y - p.y, q.z - p.z) < tolerance)) images.push(p);
    }
    classSizes.push(images.length);
    atoms.push(...images);
  }
  return { atoms, classSizes };
}
