/**
 * Generates the demo batch in examples/demo/: an invented screening set ("the Halden group's
 * ligand and precursor screen", see examples/README.md) of small ligands, fragments and metal
 * complexes as they come out of a geometry optimizer — ideal geometries, each turned to a random
 * orientation and given seeded Gaussian noise of 1e-3 Å per coordinate, which is what "converged"
 * looks like. Three structures are bad on purpose: one over the displacement budget, one on a
 * knife edge, one unreadable frame.
 *
 * Bond lengths and angles are rounded textbook values quoted from memory (approximate); they only
 * need to be plausible. The point groups they carry follow from the construction (every builder
 * places atoms symmetrically), which is what the demo shows.
 *
 * Run: npx tsx examples/make-demo.ts   (deterministic: the same files every time)
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

type V = [number, number, number];
interface Atom {
  element: string;
  p: V;
}
interface Molecule {
  name: string;
  atoms: Atom[];
  charge?: number;
  multiplicity?: number;
  /** Extra noise on top of the optimizer's, or a deliberate distortion, applied before noise. */
  distort?: (atoms: Atom[]) => Atom[];
}

// --- small vector helpers ---------------------------------------------------------------------
const add = (a: V, b: V): V => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const scale = (a: V, s: number): V => [a[0] * s, a[1] * s, a[2] * s];
const norm = (a: V) => Math.hypot(a[0], a[1], a[2]);
const unit = (a: V): V => scale(a, 1 / norm(a));
const deg = (d: number) => (d * Math.PI) / 180;
const at = (element: string, p: V): Atom => ({ element, p });
/** Point at distance r from the origin in direction (polar θ from +z, azimuth φ), degrees. */
const polar = (r: number, theta: number, phi: number): V => [
  r * Math.sin(deg(theta)) * Math.cos(deg(phi)),
  r * Math.sin(deg(theta)) * Math.sin(deg(phi)),
  r * Math.cos(deg(theta)),
];
const TETRA: V[] = [unit([1, 1, 1]), unit([1, -1, -1]), unit([-1, 1, -1]), unit([-1, -1, 1])];
const OCTA: V[] = [[1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [0, 0, 1], [0, 0, -1]];

// --- seeded randomness (mulberry32; Box–Muller) ------------------------------------------------
function rng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const gauss = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  return { next, gauss };
}

/** A uniformly random rotation matrix (from a random unit quaternion). */
function randomRotation(r: ReturnType<typeof rng>): number[] {
  let q: number[];
  do q = [r.gauss(), r.gauss(), r.gauss(), r.gauss()];
  while (Math.hypot(...q) < 1e-6);
  const n = Math.hypot(...q);
  const [w, x, y, z] = q.map((c) => c / n);
  return [
    1 - 2 * (y * y + z * z), 2 * (x * y - w * z), 2 * (x * z + w * y),
    2 * (x * y + w * z), 1 - 2 * (x * x + z * z), 2 * (y * z - w * x),
    2 * (x * z - w * y), 2 * (y * z + w * x), 1 - 2 * (x * x + y * y),
  ];
}
const rotate = (m: number[], p: V): V => [
  m[0] * p[0] + m[1] * p[1] + m[2] * p[2],
  m[3] * p[0] + m[4] * p[1] + m[5] * p[2],
  m[6] * p[0] + m[7] * p[1] + m[8] * p[2],
];

// --- builders (ideal geometries; distances in Å, from memory, approximate) -----------------------
const water = (rOH = 0.957, angle = 104.5): Atom[] => [
  at('O', [0, 0, 0]),
  at('H', [rOH * Math.sin(deg(angle / 2)), 0, rOH * Math.cos(deg(angle / 2))]),
  at('H', [-rOH * Math.sin(deg(angle / 2)), 0, rOH * Math.cos(deg(angle / 2))]),
];
/** AX3 pyramid (C3v) with apex A on +z: X at polar angle theta from +z. */
const pyramid = (a: string, x: string, r: number, theta: number): Atom[] => [
  at(a, [0, 0, 0]),
  ...[0, 120, 240].map((phi) => at(x, polar(r, theta, phi))),
];
/** Polar angle of AX3 bonds for an X–A–X angle (degrees). */
const pyramidTheta = (xax: number) => {
  // |x_i - x_j|² = 2r²(1 - cos xax) = 3 r² sin²θ  →  sin²θ = 2(1 - cos xax)/3
  return (Math.asin(Math.sqrt((2 * (1 - Math.cos(deg(xax)))) / 3)) * 180) / Math.PI;
};
const tetrahedral = (centre: string, ligands: [string, number][]): Atom[] => [
  at(centre, [0, 0, 0]),
  ...ligands.map(([el, r], i) => at(el, scale(TETRA[i], r))),
];
/** Planar ring of n atoms of radius r in the xy plane, first atom on +x. */
const ring = (el: string, n: number, r: number, z = 0, phase = 0): Atom[] =>
  Array.from({ length: n }, (_, k) => at(el, [r * Math.cos(deg(phase + (360 * k) / n)), r * Math.sin(deg(phase + (360 * k) / n)), z]));
const radialH = (ringAtoms: Atom[], r: number): Atom[] =>
  ringAtoms.map((a) => at('H', add(a.p, scale(unit([a.p[0], a.p[1], 0]), r))));
const linear = (...pairs: [string, number][]): Atom[] => pairs.map(([el, z]) => at(el, [0, 0, z]));

const benzene = (): Atom[] => {
  const c = ring('C', 6, 1.397);
  return [...c, ...radialH(c, 1.084)];
};
const pyridine = (): Atom[] => {
  const c = ring('C', 6, 1.39);
  c[0] = at('N', c[0].p);
  return [...c, ...radialH(c.slice(1), 1.083)];
};
const naphthalene = (): Atom[] => {
  // Two regular hexagons sharing the C9–C10 bond along y.
  const s = 1.40;
  const h = (s * Math.sqrt(3)) / 2;
  const cs: V[] = [
    [0, s / 2, 0], [0, -s / 2, 0],
    [h, s, 0], [2 * h, s / 2, 0], [2 * h, -s / 2, 0], [h, -s, 0],
    [-h, s, 0], [-2 * h, s / 2, 0], [-2 * h, -s / 2, 0], [-h, -s, 0],
  ];
  const atoms = cs.map((p) => at('C', p));
  const hs: Atom[] = [];
  const centreOf = (p: V): V => [p[0] > 0 ? h : -h, 0, 0];
  for (const p of cs.slice(2)) hs.push(at('H', add(p, scale(unit(add(p, scale(centreOf(p), -1))), 1.085))));
  return [...atoms, ...hs];
};
const ethylene = (): Atom[] => {
  const c = 1.339 / 2;
  const hx = 1.086 * Math.sin(deg(117.6 / 2));
  const hz = 1.086 * Math.cos(deg(117.6 / 2));
  return [at('C', [0, 0, c]), at('C', [0, 0, -c]), at('H', [hx, 0, c + hz]), at('H', [-hx, 0, c + hz]), at('H', [hx, 0, -c - hz]), at('H', [-hx, 0, -c - hz])];
};
const formaldehyde = (): Atom[] => {
  const hx = 1.111 * Math.sin(deg(116.5 / 2));
  const hz = 1.111 * Math.cos(deg(116.5 / 2));
  return [at('C', [0, 0, 0]), at('O', [0, 0, 1.205]), at('H', [hx, 0, -hz]), at('H', [-hx, 0, -hz])];
};
const methanol = (): Atom[] => {
  // C–O along z; hydroxyl H in the xz plane, methyl H staggered: one in the plane, two mirrored.
  const atoms = [at('C', [0, 0, 0]), at('O', [0, 0, 1.427])];
  atoms.push(at('H', add([0, 0, 1.427], polar(0.956, 180 - 108.5, 0))));
  atoms.push(at('H', polar(1.094, 109.5, 180)), at('H', polar(1.094, 109.5, 60)), at('H', polar(1.094, 109.5, -60)));
  return atoms;
};
const ethaneStaggered = (): Atom[] => {
  const c = 1.535 / 2;
  const top = [0, 120, 240].map((phi) => at('H', add([0, 0, c], polar(1.094, 180 - 111.2, phi))));
  const bottom = [60, 180, 300].map((phi) => at('H', add([0, 0, -c], polar(1.094, 111.2, phi))));
  return [at('C', [0, 0, c]), at('C', [0, 0, -c]), ...top, ...bottom];
};
const cyclohexaneChair = (): Atom[] => {
  const h = 0.25;
  const R = Math.sqrt(1.53 ** 2 - (2 * h) ** 2);
  const cs = Array.from({ length: 6 }, (_, k): V => [R * Math.cos(deg(60 * k)), R * Math.sin(deg(60 * k)), k % 2 ? -h : h]);
  const atoms = cs.map((p) => at('C', p));
  for (const p of cs) {
    const up = p[2] > 0 ? 1 : -1;
    atoms.push(at('H', add(p, [0, 0, up * 1.09]))); // axial
    const radial = unit([p[0], p[1], 0]);
    atoms.push(at('H', add(p, scale(unit(add(scale(radial, Math.cos(deg(19.5))), [0, 0, -up * Math.sin(deg(19.5))])), 1.09)))); // equatorial
  }
  return atoms;
};
const allene = (): Atom[] => {
  const cc = 1.308;
  const hx = 1.087 * Math.sin(deg(118.2 / 2));
  const hz = 1.087 * Math.cos(deg(118.2 / 2));
  return [
    at('C', [0, 0, 0]), at('C', [0, 0, cc]), at('C', [0, 0, -cc]),
    at('H', [hx, 0, cc + hz]), at('H', [-hx, 0, cc + hz]),
    at('H', [0, hx, -cc - hz]), at('H', [0, -hx, -cc - hz]),
  ];
};
const boricAcid = (): Atom[] => {
  const atoms = [at('B', [0, 0, 0])];
  for (const phi of [0, 120, 240]) {
    const o = polar(1.361, 90, phi);
    atoms.push(at('O', o));
    // B–O–H 114°, every H turned the same way round the ring (C3h).
    atoms.push(at('H', add(o, polar(0.967, 90, phi + 180 - 114))));
  }
  return atoms;
};
const hydrogenPeroxide = (): Atom[] => {
  const o = 1.475 / 2;
  const half = 111.5 / 2;
  return [
    at('O', [0, 0, o]), at('O', [0, 0, -o]),
    at('H', add([0, 0, o], polar(0.95, 180 - 94.8, half))),
    at('H', add([0, 0, -o], polar(0.95, 94.8, -half))),
  ];
};
const transDichloroethylene = (): Atom[] => {
  const c = 1.33 / 2;
  return [
    at('C', [0, 0, c]), at('C', [0, 0, -c]),
    at('Cl', add([0, 0, c], polar(1.73, 60, 0))), at('Cl', add([0, 0, -c], polar(1.73, 120, 180))),
    at('H', add([0, 0, c], polar(1.08, 60, 180))), at('H', add([0, 0, -c], polar(1.08, 120, 0))),
  ];
};
const p4 = (): Atom[] => TETRA.map((d) => at('P', scale(d, 2.21 * Math.sqrt(3 / 8))));
const s8Crown = (): Atom[] => Array.from({ length: 8 }, (_, k) => at('S', [2.2 * Math.cos(deg(45 * k)), 2.2 * Math.sin(deg(45 * k)), k % 2 ? -0.5 : 0.5]));
const octahedral = (m: string, x: string, r: number): Atom[] => [at(m, [0, 0, 0]), ...OCTA.map((d) => at(x, scale(d, r)))];
const carbonyls = (m: string, dirs: V[], rMC: number, rCO = 1.14): Atom[] => [
  at(m, [0, 0, 0]),
  ...dirs.map((d) => at('C', scale(d, rMC))),
  ...dirs.map((d) => at('O', scale(d, rMC + rCO))),
];
const ironPentacarbonyl = (): Atom[] => {
  const axial: V[] = [[0, 0, 1], [0, 0, -1]];
  const equatorial = [0, 120, 240].map((phi) => polar(1, 90, phi));
  const ax = carbonyls('Fe', axial, 1.81, 1.15);
  const eq = carbonyls('Fe', equatorial, 1.83, 1.15);
  return [...ax, ...eq.slice(1)];
};
const ferroceneEclipsed = (): Atom[] => {
  const r = 1.44 / (2 * Math.sin(deg(36)));
  const top = ring('C', 5, r, 1.66);
  const bottom = ring('C', 5, r, -1.66);
  return [at('Fe', [0, 0, 0]), ...top, ...bottom, ...radialH(top, 1.08), ...radialH(bottom, 1.08)];
};
const squarePlanar = (m: string, x: string, r: number): Atom[] => [at(m, [0, 0, 0]), ...OCTA.slice(0, 4).map((d) => at(x, scale(d, r)))];
const trigonalBipyramid = (m: string, x: string, rax: number, req: number): Atom[] => [
  at(m, [0, 0, 0]),
  at(x, [0, 0, rax]), at(x, [0, 0, -rax]),
  ...[0, 120, 240].map((phi) => at(x, polar(req, 90, phi))),
];
const icosahedron = (): V[] => {
  const g = (1 + Math.sqrt(5)) / 2;
  const vs: V[] = [];
  for (const a of [-1, 1]) for (const b of [-g, g]) vs.push([0, a, b], [a, b, 0], [b, 0, a]);
  return vs.map(unit);
};
const closoDodecaborate = (): Atom[] => {
  const rB = 1.78 * 0.9511; // circumradius of an icosahedron with edge 1.78 Å
  return [...icosahedron().map((d) => at('B', scale(d, rB))), ...icosahedron().map((d) => at('H', scale(d, rB + 1.19)))];
};

// --- the screen -------------------------------------------------------------------------------

/** Jahn–Teller-like tetragonal elongation of the two ligands on the z axis. */
const elongate = (dz: number) => (atoms: Atom[]): Atom[] =>
  atoms.map((a) => (a.element !== 'Cu' && Math.abs(a.p[2]) > 1 ? at(a.element, add(a.p, [0, 0, Math.sign(a.p[2]) * dz])) : a));

const ligands: Molecule[] = [
  { name: 'L01 aqua', atoms: water() },
  { name: 'L02 ammine', atoms: pyramid('N', 'H', 1.012, pyramidTheta(106.7)) },
  { name: 'L03 formaldehyde', atoms: formaldehyde() },
  { name: 'L04 hydrogen cyanide', atoms: linear(['H', -1.065], ['C', 0], ['N', 1.153]) },
  { name: 'L05 carbon dioxide', atoms: linear(['O', -1.16], ['C', 0], ['O', 1.16]) },
  { name: 'L06 acetylene', atoms: linear(['H', -1.6645], ['C', -0.6015], ['C', 0.6015], ['H', 1.6645]) },
  { name: 'L07 ethylene', atoms: ethylene() },
  { name: 'L08 benzene', atoms: benzene() },
  { name: 'L09 pyridine', atoms: pyridine() },
  { name: 'L10 boron trifluoride', atoms: [at('B', [0, 0, 0]), ...[0, 120, 240].map((phi) => at('F', polar(1.307, 90, phi)))] },
  { name: 'L11 methanol', atoms: methanol() },
];
/** Frame 12 of ligands.xyz: a coordinate the optimizer's log mangled (unreadable on purpose). */
const BAD_FRAME_INDEX = 5;

const fragments: Molecule[] = [
  { name: 'F01 methane', atoms: tetrahedral('C', [['H', 1.087], ['H', 1.087], ['H', 1.087], ['H', 1.087]]) },
  { name: 'F02 carbon tetrachloride', atoms: tetrahedral('C', [['Cl', 1.767], ['Cl', 1.767], ['Cl', 1.767], ['Cl', 1.767]]) },
  { name: 'F03 dichloromethane', atoms: [at('C', [0, 0, 0]), at('Cl', polar(1.772, 56, 0)), at('Cl', polar(1.772, 56, 180)), at('H', polar(1.087, 124.25, 90)), at('H', polar(1.087, 124.25, 270))] },
  { name: 'F04 chloroform', atoms: [...pyramid('C', 'Cl', 1.762, 180 - pyramidTheta(111.3)), at('H', [0, 0, 1.073])] },
  { name: 'F05 bromochlorofluoromethane', atoms: tetrahedral('C', [['H', 1.08], ['F', 1.36], ['Cl', 1.76], ['Br', 1.93]]) },
  { name: 'F06 ethane (staggered)', atoms: ethaneStaggered() },
  { name: 'F07 cyclohexane (chair)', atoms: cyclohexaneChair() },
  { name: 'F08 naphthalene', atoms: naphthalene() },
  { name: 'F09 allene', atoms: allene() },
  { name: 'F10 boric acid', atoms: boricAcid() },
  { name: 'F11 hydrogen peroxide', atoms: hydrogenPeroxide() },
  { name: 'F12 trans-1,2-dichloroethylene', atoms: transDichloroethylene() },
  { name: 'F13 tetraphosphorus', atoms: p4() },
  { name: 'F14 cyclo-octasulfur (crown)', atoms: s8Crown() },
  {
    // Knife edge: the optimizer stopped with one N–H 0.06 Å long. At the demo's 0.1 Å tolerance it
    // still reads as C3v, at half of it only as Cs.
    name: 'F15 ammine (stopped early)',
    atoms: pyramid('N', 'H', 1.012, pyramidTheta(106.7)),
    distort: (atoms) => atoms.map((a, i) => (i === 1 ? at('H', scale(a.p, (1.012 + 0.06) / 1.012)) : a)),
  },
];

const complexes: Molecule[] = [
  { name: 'C01 hexacarbonylchromium', atoms: carbonyls('Cr', OCTA, 1.91) },
  { name: 'C02 pentacarbonyliron', atoms: ironPentacarbonyl() },
  { name: 'C03 tetracarbonylnickel', atoms: carbonyls('Ni', TETRA, 1.82, 1.15) },
  { name: 'C04 ferrocene (eclipsed)', atoms: ferroceneEclipsed() },
  { name: 'C05 tetrachloroplatinate', atoms: squarePlanar('Pt', 'Cl', 2.31), charge: -2 },
  {
    // Over budget: a Jahn–Teller-elongated d9 complex. At 0.1 Å it is perceived as Oh, and snapping
    // there moves the axial chlorides by about 0.053 Å — more than the 0.05 Å budget.
    name: 'C06 hexachlorocuprate (elongated)',
    atoms: octahedral('Cu', 'Cl', 2.3),
    charge: -4,
    multiplicity: 2,
    distort: elongate(0.08),
  },
  { name: 'C07 phosphorus pentafluoride', atoms: trigonalBipyramid('P', 'F', 1.577, 1.534) },
  { name: 'C08 xenon tetrafluoride', atoms: squarePlanar('Xe', 'F', 1.95) },
  { name: 'C09 sulfur hexafluoride', atoms: octahedral('S', 'F', 1.561) },
];

const clusters: Molecule[] = [{ name: 'K01 closo-dodecaborate', atoms: closoDodecaborate(), charge: -2 }];

/** Optimizer output: random orientation and position, Gaussian noise σ = 1e-3 Å per coordinate. */
function asOptimized(m: Molecule, seed: number): Atom[] {
  const r = rng(seed);
  const atoms = m.distort ? m.distort(m.atoms) : m.atoms;
  const rot = randomRotation(r);
  const shift: V = [r.gauss() * 3, r.gauss() * 3, r.gauss() * 3];
  return atoms.map((a) => at(a.element, add(add(rotate(rot, a.p), shift), [r.gauss() * 1e-3, r.gauss() * 1e-3, r.gauss() * 1e-3])));
}

const f = (x: number, w = 14, d = 8) => x.toFixed(d).padStart(w);

function xyzFrame(m: Molecule, atoms: Atom[]): string {
  const extras = [m.charge !== undefined ? `charge=${m.charge}` : '', m.multiplicity !== undefined ? `multiplicity=${m.multiplicity}` : '']
    .filter(Boolean)
    .join(' ');
  return [String(atoms.length), `${m.name}${extras ? ` ${extras}` : ''}`, ...atoms.map((a) => `${a.element.padEnd(2)} ${f(a.p[0])} ${f(a.p[1])} ${f(a.p[2])}`)].join('\n') + '\n';
}

function sdfRecord(m: Molecule, atoms: Atom[]): string {
  const lines = [m.name, '  PtfDemo          3D', 'demo screen, optimizer output'];
  lines.push(`${String(atoms.length).padStart(3)}${'0'.padStart(3)}  0  0  0  0  0  0  0  0999 V2000`);
  for (const a of atoms) lines.push(`${f(a.p[0], 10, 4)}${f(a.p[1], 10, 4)}${f(a.p[2], 10, 4)} ${a.element.padEnd(3)} 0  0  0  0  0  0  0  0  0  0  0  0`);
  lines.push('M  END');
  if (m.charge !== undefined) lines.push('> <charge>', String(m.charge), '');
  if (m.multiplicity !== undefined) lines.push('> <multiplicity>', String(m.multiplicity), '');
  lines.push('$$$$');
  return lines.join('\n') + '\n';
}

const BOHR = 0.529177210903; // Å per bohr, CODATA 2018

function qcschemaMolecule(m: Molecule, atoms: Atom[]) {
  return {
    schema_name: 'qcschema_molecule',
    schema_version: 2,
    name: m.name,
    symbols: atoms.map((a) => a.element),
    geometry: atoms.flatMap((a) => a.p.map((c) => Number((c / BOHR).toFixed(10)))),
    molecular_charge: m.charge ?? 0,
    molecular_multiplicity: m.multiplicity ?? 1,
  };
}

const out = join(dirname(fileURLToPath(import.meta.url)), 'demo');
mkdirSync(out, { recursive: true });

let seed = 20_260_101;
const xyz = ligands.map((m) => xyzFrame(m, asOptimized(m, seed++)));
// The unreadable frame: a coordinate with a typo'd exponent, as a log scraper might leave it.
const bad = xyzFrame({ name: 'L12 carbon monoxide (log scrape)', atoms: [] }, [at('C', [0, 0, 0]), at('O', [0, 0, 1.128])]).replace(/1\.12800000/, '1.128O0000');
xyz.splice(BAD_FRAME_INDEX, 0, bad);
writeFileSync(join(out, 'ligands.xyz'), xyz.join(''));
writeFileSync(join(out, 'fragments.xyz'), fragments.map((m) => xyzFrame(m, asOptimized(m, seed++))).join(''));
writeFileSync(join(out, 'complexes.sdf'), complexes.map((m) => sdfRecord(m, asOptimized(m, seed++))).join(''));
writeFileSync(
  join(out, 'clusters.qcschema.json'),
  JSON.stringify(clusters.map((m) => qcschemaMolecule(m, asOptimized(m, seed++))), null, 1) + '\n',
);
const count = ligands.length + 1 + fragments.length + complexes.length + clusters.length;
process.stderr.write(`wrote ${count} structures (one unreadable on purpose) to ${out}\n`);
