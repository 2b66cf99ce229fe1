/**
 * Builders for the 49 reference molecules of shared/reference/reference-molecules.md, from the
 * handbook values in that table, in the ideal frame it describes (principal axis on z, fixed
 * point at the origin; the table's extra frame notes are followed where it gives them).
 *
 * Each entry keeps the table's point group, its source and confidence text, and a list of
 * `checks`: the table's bond lengths / angles / twists recomputed from the built coordinates.
 * molecules.test.ts asserts every check to 1e-9, which validates these builders before they are
 * used to validate the engine. Lengths in Å, angles in degrees.
 */
import {
  type Atom,
  type Mat3,
  type Vec3,
  DEG,
  INVERSION,
  PHI,
  TETRAHEDRAL,
  X,
  Z,
  add,
  angle,
  atom,
  closeGroup,
  cross,
  dihedral,
  dist,
  dot,
  improper,
  matVec,
  orbit,
  pos,
  rotation,
  scale,
  sub,
  unit,
} from './geometry';

/** One value from the table (or derived from it) that the built coordinates must reproduce. */
export interface GeometryCheck {
  label: string;
  expected: number;
  actual: (atoms: readonly Atom[]) => number[];
  /** Default 1e-9; larger only for values the table itself gives rounded ("comes out at 54.94"). */
  tolerance?: number;
}

export interface ReferenceMolecule {
  /** Row number (#) of reference-molecules.md. */
  id: number;
  name: string;
  /** Expected Schoenflies group, plain text as the engine writes it (C∞v, D∞h, S6). */
  pointGroup: string;
  /** "PG source" column, verbatim or nearly. */
  pointGroupSource: string;
  /** "Geometry source / confidence" column (verified / memory / model), verbatim or nearly. */
  geometrySource: string;
  /** Expected Hill formula of the built atoms. */
  formula: string;
  /** Formal charge of the species (so the engine's electron-count check is fair). */
  charge: number;
  atoms: Atom[];
  checks: GeometryCheck[];
}

/** Ideal tetrahedral angle arccos(−1/3), degrees. */
export const TET = Math.acos(-1 / 3) / DEG;

// ---------------------------------------------------------------------------------------------
// Local construction helpers
// ---------------------------------------------------------------------------------------------

/** Unit vector with polar angle `polar` from +z and azimuth `azimuth` from +x (degrees). */
export function sph(polar: number, azimuth: number): Vec3 {
  const p = polar * DEG;
  const a = azimuth * DEG;
  return [Math.sin(p) * Math.cos(a), Math.sin(p) * Math.sin(a), Math.cos(p)];
}

/**
 * Unit vector at angle `theta` (deg) from `axis`, turned by `psi` (deg) about the axis, starting
 * from the component of `ref` perpendicular to the axis (right-handed about the axis).
 */
export function cone(axis: Vec3, ref: Vec3, theta: number, psi: number): Vec3 {
  const a = unit(axis);
  const e1 = unit(sub(ref, scale(a, dot(ref, a))));
  const e2 = cross(a, e1);
  const t = theta * DEG;
  const s = psi * DEG;
  return add(scale(a, Math.cos(t)), add(scale(e1, Math.sin(t) * Math.cos(s)), scale(e2, Math.sin(t) * Math.sin(s))));
}

/** Accumulates atoms and hands back their indices, so checks can name atoms by index. */
class Builder {
  readonly atoms: Atom[] = [];
  add(element: string, p: Vec3): number {
    this.atoms.push(atom(element, p));
    return this.atoms.length - 1;
  }
}

const P = (atoms: readonly Atom[], i: number): Vec3 => pos(atoms[i]);
const bonds = (label: string, expected: number, pairs: [number, number][]): GeometryCheck => ({
  label,
  expected,
  actual: (a) => pairs.map(([i, j]) => dist(P(a, i), P(a, j))),
});
const angles = (label: string, expected: number, triples: [number, number, number][]): GeometryCheck => ({
  label,
  expected,
  actual: (a) => triples.map(([i, j, k]) => angle(P(a, i), P(a, j), P(a, k))),
});
/** Absolute value of dihedrals (the sign depends only on the handedness chosen). */
const torsions = (label: string, expected: number, quads: [number, number, number, number][], tolerance?: number): GeometryCheck => ({
  label,
  expected,
  actual: (a) => quads.map(([i, j, k, l]) => Math.abs(dihedral(P(a, i), P(a, j), P(a, k), P(a, l)))),
  tolerance,
});
const range = (n: number) => Array.from({ length: n }, (_, i) => i);

/** Hydrogen radially outward from a ring atom at `p` (ring centre on the z axis at the same height). */
function radialInPlane(p: Vec3, length: number): Vec3 {
  return add(p, scale(unit([p[0], p[1], 0]), length));
}

/**
 * Regular planar n-ring of bond length `bond` at height z, atoms at azimuths offset + 360k/n.
 * Returns positions; radius = bond / (2 sin(π/n)).
 */
function planarRing(n: number, bond: number, z: number, offset: number): Vec3[] {
  const r = bond / (2 * Math.sin(Math.PI / n));
  return range(n).map((k) => {
    const a = (offset + (360 * k) / n) * DEG;
    return [r * Math.cos(a), r * Math.sin(a), z] as Vec3;
  });
}

/**
 * Puckered (chair / crown) ring of even size n: atoms at radius ρ, azimuths offset + 360k/n,
 * heights ±h alternately, with all bonds `bond` and all ring angles `ringAngle`.
 * For neighbours on a circle, |A−B|² = c1ρ² + 4h² and (A−B)·(C−B) = c2ρ² + 4h² with
 * c1 = 2 − 2cos(2π/n), c2 = cos(4π/n) − 2cos(2π/n) + 1; solving gives ρ² = d²(1 − cos α)/(c1 − c2).
 */
function puckeredRing(n: number, bond: number, ringAngle: number, offset: number): Vec3[] {
  const c1 = 2 - 2 * Math.cos((2 * Math.PI) / n);
  const c2 = Math.cos((4 * Math.PI) / n) - 2 * Math.cos((2 * Math.PI) / n) + 1;
  const d2 = bond * bond;
  const rho = Math.sqrt((d2 * (1 - Math.cos(ringAngle * DEG))) / (c1 - c2));
  const h = Math.sqrt(d2 - c1 * rho * rho) / 2;
  return range(n).map((k) => {
    const a = (offset + (360 * k) / n) * DEG;
    return [rho * Math.cos(a), rho * Math.sin(a), k % 2 === 0 ? h : -h] as Vec3;
  });
}

/** The 12 vertices (0, ±1, ±φ) and cyclic permutations, scaled by s (edge length 2s). */
export function icosahedronVertices(s: number): Vec3[] {
  const out: Vec3[] = [];
  for (const a of [1, -1])
    for (const b of [PHI, -PHI]) {
      out.push([0, a * s, b * s], [a * s, b * s, 0], [b * s, 0, a * s]);
    }
  return out;
}

/** The rotation group O from C4(z) and C3(1,1,1), order 24. */
export const GROUP_O: Mat3[] = closeGroup([rotation(Z, Math.PI / 2), rotation([1, 1, 1], (2 * Math.PI) / 3)]);
/**
 * The rotation group I, order 60, in the frame with C2 axes on x, y, z and icosahedron vertices
 * at (0, ±1, ±φ): generated by C2(z), C3 about (1,1,1) (a face centre) and C5 about the
 * vertex (0, 1, φ).
 */
export const GROUP_I: Mat3[] = closeGroup([
  rotation(Z, Math.PI),
  rotation([1, 1, 1], (2 * Math.PI) / 3),
  rotation([0, 1, PHI], (2 * Math.PI) / 5),
]);

// ---------------------------------------------------------------------------------------------
// Parametrised builders (used by the "built-in series" too)
// ---------------------------------------------------------------------------------------------

/**
 * X3A–BY3 with the A–B bond on z, midpoint at the origin, ends twisted by `twist` degrees
 * (0 = eclipsed). End 1 (z > 0) at azimuths −twist/2 + 360k/n, end 2 at +twist/2 + 360k/n, so a
 * C2 (when the ends are alike) lies on x for every twist.
 */
function twistedPair(
  b: Builder,
  opts: { n: number; a: string; bAtom: string; ab: number; x: string; y: string; ax: number; by: number; angleXAB: number; angleYBA: number; twist: number },
) {
  const a1 = b.add(opts.a, [0, 0, opts.ab / 2]);
  const a2 = b.add(opts.bAtom, [0, 0, -opts.ab / 2]);
  const xs = range(opts.n).map((k) => b.add(opts.x, add(P(b.atoms, a1), scale(sph(180 - opts.angleXAB, -opts.twist / 2 + (360 * k) / opts.n), opts.ax))));
  const ys = range(opts.n).map((k) => b.add(opts.y, add(P(b.atoms, a2), scale(sph(opts.angleYBA, opts.twist / 2 + (360 * k) / opts.n), opts.by))));
  return { a1, a2, xs, ys };
}

/** Ethane C–C 1.522, C–H 1.089, ∠HCC 111.2 (table #19), twisted by `twist` (0 eclipsed, 60 staggered). */
export function ethane(twist: number): { atoms: Atom[]; checks: GeometryCheck[] } {
  const b = new Builder();
  const { a1, a2, xs, ys } = twistedPair(b, { n: 3, a: 'C', bAtom: 'C', ab: 1.522, x: 'H', y: 'H', ax: 1.089, by: 1.089, angleXAB: 111.2, angleYBA: 111.2, twist });
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.522, [[a1, a2]]),
      bonds('C–H', 1.089, [...xs.map((h) => [a1, h] as [number, number]), ...ys.map((h) => [a2, h] as [number, number])]),
      angles('∠HCC', 111.2, [...xs.map((h) => [h, a1, a2] as [number, number, number]), ...ys.map((h) => [h, a2, a1] as [number, number, number])]),
      torsions('twist H–C–C–H', twist, [[xs[0], a1, a2, ys[0]]]),
    ],
  };
}

/** [Re2Cl8]2−: Re–Re 2.24, Re–Cl 2.29, ∠Re–Re–Cl 103.7 (table #15), twisted by `twist` (0 eclipsed, 45 staggered). */
export function re2cl8(twist: number): { atoms: Atom[]; checks: GeometryCheck[] } {
  const b = new Builder();
  const { a1, a2, xs, ys } = twistedPair(b, { n: 4, a: 'Re', bAtom: 'Re', ab: 2.24, x: 'Cl', y: 'Cl', ax: 2.29, by: 2.29, angleXAB: 103.7, angleYBA: 103.7, twist });
  return {
    atoms: b.atoms,
    checks: [
      bonds('Re–Re', 2.24, [[a1, a2]]),
      bonds('Re–Cl', 2.29, [...xs.map((c) => [a1, c] as [number, number]), ...ys.map((c) => [a2, c] as [number, number])]),
      angles('∠Re–Re–Cl', 103.7, [...xs.map((c) => [c, a1, a2] as [number, number, number]), ...ys.map((c) => [c, a2, a1] as [number, number, number])]),
      torsions('twist Cl–Re–Re–Cl', twist, [[xs[0], a1, a2, ys[0]]]),
    ],
  };
}

/**
 * M(η-CnHn)2 sandwich: metal at the origin, rings at ±h with M–C `mc`, ring C–C `cc`, C–H `ch`
 * (H in the ring plane, radial). Ring 1 at azimuths −twist/2 + 360k/n, ring 2 at +twist/2.
 */
export function sandwich(metal: string, n: number, mc: number, cc: number, ch: number, twist: number) {
  const b = new Builder();
  const R = cc / (2 * Math.sin(Math.PI / n));
  const h = Math.sqrt(mc * mc - R * R);
  const m = b.add(metal, [0, 0, 0]);
  const rings = [
    { z: h, off: -twist / 2 },
    { z: -h, off: twist / 2 },
  ].map(({ z, off }) => {
    const cs = planarRing(n, cc, z, off).map((p) => b.add('C', p));
    const hs = cs.map((c) => b.add('H', radialInPlane(P(b.atoms, c), ch)));
    return { cs, hs };
  });
  const ringBonds = rings.flatMap(({ cs }) => cs.map((c, k) => [c, cs[(k + 1) % n]] as [number, number]));
  const cHAngles = rings.flatMap(({ cs, hs }) => cs.map((c, k) => [cs[(k + 1) % n], c, hs[k]] as [number, number, number]));
  const checks: GeometryCheck[] = [
    bonds(`${metal}–C`, mc, rings.flatMap(({ cs }) => cs.map((c) => [m, c] as [number, number]))),
    bonds('C–C (ring)', cc, ringBonds),
    bonds('C–H', ch, rings.flatMap(({ cs, hs }) => cs.map((c, k) => [c, hs[k]] as [number, number]))),
    // H in the ring plane, radial: ∠C–C–H = 180 − (ring interior angle)/2.
    angles('∠C–C–H (H in plane, radial)', 180 - (180 - 360 / n) / 2, cHAngles),
    // Twist between the rings as the dihedral C(ring 1)–centre 1–centre 2–C(ring 2); the ring
    // centres (0, 0, ±h) are not atoms, so it is computed directly.
    {
      label: 'ring twist',
      expected: twist,
      actual: (a) => [Math.abs(dihedral(P(a, rings[0].cs[0]), [0, 0, h], [0, 0, -h], P(a, rings[1].cs[0])))],
    },
  ];
  return { atoms: b.atoms, checks };
}

/**
 * Biphenyl: ring C–C 1.397, C–H 1.08, inter-ring C–C 1.507 on z (table #13); ring planes at
 * azimuths ±twist/2 so the three C2 axes lie on x, y, z.
 */
export function biphenyl(twist: number): { atoms: Atom[]; checks: GeometryCheck[] } {
  const a = 1.397;
  const L = 1.507;
  const ch = 1.08;
  const b = new Builder();
  const rings = [1, -1].map((s) => {
    const c: Vec3 = [0, 0, s * (L / 2 + a)];
    const e = sph(90, (s * twist) / 2);
    const dirs = range(6).map((k) => add(scale([0, 0, 1], -s * Math.cos(60 * k * DEG)), scale(e, Math.sin(60 * k * DEG))));
    const cs = dirs.map((d) => b.add('C', add(c, scale(d, a))));
    const hs = dirs.slice(1).map((d) => b.add('H', add(c, scale(d, a + ch))));
    return { cs, hs };
  });
  const ringBonds = rings.flatMap(({ cs }) => cs.map((c, k) => [c, cs[(k + 1) % 6]] as [number, number]));
  return {
    atoms: b.atoms,
    checks: [
      bonds('ring C–C', a, ringBonds),
      bonds('C–H', ch, rings.flatMap(({ cs, hs }) => hs.map((h, k) => [cs[k + 1], h] as [number, number]))),
      bonds('inter-ring C–C', L, [[rings[0].cs[0], rings[1].cs[0]]]),
      angles('∠CCC (regular hexagon)', 120, rings.flatMap(({ cs }) => cs.map((c, k) => [cs[(k + 5) % 6], c, cs[(k + 1) % 6]] as [number, number, number]))),
      angles('∠C–C–H (radial H)', 120, rings.flatMap(({ cs, hs }) => hs.map((h, k) => [cs[(k + 2) % 6], cs[k + 1], h] as [number, number, number]))),
      angles('∠C(ortho)–C(ipso)–C(ipso′)', 120, rings.map(({ cs }, r) => [cs[1], cs[0], rings[1 - r].cs[0]] as [number, number, number])),
      torsions('twist C(o)–C(i)–C(i′)–C(o′)', twist, [[rings[0].cs[1], rings[0].cs[0], rings[1].cs[0], rings[1].cs[1]]]),
    ],
  };
}

/**
 * Neopentane C(CH3)4: C–C 1.537, C–H 1.09, ∠HCC 110 (table #36). The first methyl sits on
 * (1,1,1); its H are turned by `turn` degrees from the Td position (one H in the σd plane x = y,
 * pointing away from the centre, i.e. staggered); the other methyls are its images under the C2
 * rotations about x, y, z, so the T rotations are kept for every turn and σd/S4 only at 0.
 */
export function neopentane(turn: number): { atoms: Atom[]; checks: GeometryCheck[] } {
  const b = new Builder();
  const c0 = b.add('C', [0, 0, 0]);
  const t0 = TETRAHEDRAL[0];
  const cm0 = scale(t0, 1.537);
  const h0 = range(3).map((k) => add(cm0, scale(cone(t0, [1, 1, -2], 180 - 110, turn + 120 * k), 1.09)));
  const c2s: Mat3[] = [
    [1, 0, 0, 0, 1, 0, 0, 0, 1],
    rotation(X, Math.PI),
    rotation([0, 1, 0], Math.PI),
    rotation(Z, Math.PI),
  ];
  const methyls = c2s.map((g) => {
    const c = b.add('C', matVec(g, cm0));
    const hs = h0.map((h) => b.add('H', matVec(g, h)));
    return { c, hs };
  });
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.537, methyls.map(({ c }) => [c0, c] as [number, number])),
      bonds('C–H', 1.09, methyls.flatMap(({ c, hs }) => hs.map((h) => [c, h] as [number, number]))),
      angles('∠HCC', 110, methyls.flatMap(({ c, hs }) => hs.map((h) => [h, c, c0] as [number, number, number]))),
      angles('∠CCC (tetrahedral)', TET, [[methyls[0].c, c0, methyls[1].c], [methyls[2].c, c0, methyls[3].c]]),
    ],
  };
}

// ---------------------------------------------------------------------------------------------
// The 49 entries
// ---------------------------------------------------------------------------------------------

type Built = { atoms: Atom[]; checks: GeometryCheck[] };
type Entry = Omit<ReferenceMolecule, 'atoms' | 'checks'> & { build: () => Built };

function m1(): Built {
  const b = new Builder();
  const c = b.add('C', [0, 0, 0]);
  const subs: [string, number][] = [['H', 1.09], ['F', 1.35], ['Cl', 1.76], ['Br', 1.93]];
  const idx = subs.map(([el, r], k) => b.add(el, scale(TETRAHEDRAL[k], r)));
  const pairs: [number, number, number][] = [];
  for (let i = 0; i < 4; i++) for (let j = i + 1; j < 4; j++) pairs.push([idx[i], c, idx[j]]);
  return {
    atoms: b.atoms,
    checks: [...subs.map(([el, r], k) => bonds(`C–${el}`, r, [[c, idx[k]]])), angles('∠X–C–Y tetrahedral', TET, pairs)],
  };
}

function m2(): Built {
  const b = new Builder();
  const o = b.add('O', [0, 0, 0]);
  const cl = b.add('Cl', [1.69, 0, 0]);
  const h = b.add('H', scale(sph(90, 102.5), 0.964));
  return { atoms: b.atoms, checks: [bonds('O–H', 0.964, [[o, h]]), bonds('O–Cl', 1.69, [[o, cl]]), angles('∠HOCl', 102.5, [[h, o, cl]])] };
}

function m3(): Built {
  const b = new Builder();
  const c1 = b.add('C', [0, 0, 0.77]);
  const subs: [string, number][] = [['H', 1.09], ['F', 1.35], ['Cl', 1.77]];
  const s1 = subs.map(([el, r], k) => b.add(el, add([0, 0, 0.77], scale(sph(180 - TET, 120 * k), r))));
  const c2 = b.add('C', matVec(INVERSION, P(b.atoms, c1)));
  const s2 = s1.map((i) => b.add(b.atoms[i].element, matVec(INVERSION, P(b.atoms, i))));
  const ang: [number, number, number][] = [];
  for (const [c, o, s] of [[c1, c2, s1], [c2, c1, s2]] as [number, number, number[]][]) {
    for (const i of s) ang.push([i, c, o]);
    ang.push([s[0], c, s[1]], [s[1], c, s[2]], [s[0], c, s[2]]);
  }
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.54, [[c1, c2]]),
      ...subs.map(([el, r], k) => bonds(`C–${el}`, r, [[c1, s1[k]], [c2, s2[k]]])),
      angles('tetrahedral angles', TET, ang),
      torsions('anti F–C–C–F', 180, [[s1[1], c1, c2, s2[1]]]),
    ],
  };
}

function m4(): Built {
  const b = new Builder();
  const d = 1.475;
  const o1 = b.add('O', [d / 2, 0, 0]);
  const o2 = b.add('O', [-d / 2, 0, 0]);
  // Half the dihedral on each side of the C2 axis (y): H1 at +55.75° about −x from y, H2 its C2(y) image.
  const h1p = add(P(b.atoms, o1), scale(cone([-1, 0, 0], [0, 1, 0], 94.8, 111.5 / 2), 0.95));
  const h1 = b.add('H', h1p);
  const h2 = b.add('H', matVec(rotation([0, 1, 0], Math.PI), h1p));
  return {
    atoms: b.atoms,
    checks: [
      bonds('O–O', 1.475, [[o1, o2]]),
      bonds('O–H', 0.95, [[o1, h1], [o2, h2]]),
      angles('∠OOH', 94.8, [[o2, o1, h1], [o1, o2, h2]]),
      torsions('dihedral HOOH', 111.5, [[h1, o1, o2, h2]]),
    ],
  };
}

function m5(): Built {
  const b = new Builder();
  const { a1, a2, xs, ys } = twistedPair(b, { n: 3, a: 'C', bAtom: 'C', ab: 1.53, x: 'H', y: 'F', ax: 1.09, by: 1.335, angleXAB: TET, angleYBA: TET, twist: 30 });
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.53, [[a1, a2]]),
      bonds('C–H', 1.09, xs.map((h) => [a1, h] as [number, number])),
      bonds('C–F', 1.335, ys.map((f) => [a2, f] as [number, number])),
      angles('tetrahedral ∠HCC/∠FCC', TET, [...xs.map((h) => [h, a1, a2] as [number, number, number]), ...ys.map((f) => [f, a2, a1] as [number, number, number])]),
      angles('tetrahedral ∠HCH/∠FCF', TET, [[xs[0], a1, xs[1]], [ys[0], a2, ys[2]]]),
      torsions('twist H–C–C–F from eclipsed', 30, [[xs[0], a1, a2, ys[0]]]),
    ],
  };
}

function m6(): Built {
  const b = new Builder();
  const r = 0.9578;
  const t = 104.4776 / 2;
  const o = b.add('O', [0, 0, 0]);
  const h1 = b.add('H', [0, r * Math.sin(t * DEG), r * Math.cos(t * DEG)]);
  const h2 = b.add('H', [0, -r * Math.sin(t * DEG), r * Math.cos(t * DEG)]);
  return { atoms: b.atoms, checks: [bonds('O–H', r, [[o, h1], [o, h2]]), angles('∠HOH', 104.4776, [[h1, o, h2]])] };
}

/** AXn pyramid: polar angle p of the ligands from +z for equal X–A–X angles α between neighbours. */
function pyramidPolar(n: number, alpha: number): number {
  // cos α = cos²p + sin²p·cos(2π/n)  ⇒  sin²p = (1 − cos α)/(1 − cos(2π/n))
  const s2 = (1 - Math.cos(alpha * DEG)) / (1 - Math.cos((2 * Math.PI) / n));
  return Math.asin(Math.sqrt(s2)) / DEG;
}

function m7(): Built {
  const b = new Builder();
  const n = b.add('N', [0, 0, 0]);
  const p = pyramidPolar(3, 106.7);
  const hs = range(3).map((k) => b.add('H', scale(sph(p, 120 * k), 1.012)));
  return {
    atoms: b.atoms,
    checks: [bonds('N–H', 1.012, hs.map((h) => [n, h] as [number, number])), angles('∠HNH', 106.7, [[hs[0], n, hs[1]], [hs[1], n, hs[2]], [hs[0], n, hs[2]]])],
  };
}

function m8(): Built {
  const b = new Builder();
  const br = b.add('Br', [0, 0, 0]);
  const ax = b.add('F', [0, 0, 1.689]);
  const eq = range(4).map((k) => b.add('F', scale(sph(84.8, 90 * k), 1.774)));
  return {
    atoms: b.atoms,
    checks: [
      bonds('Br–F(ax)', 1.689, [[br, ax]]),
      bonds('Br–F(eq)', 1.774, eq.map((f) => [br, f] as [number, number])),
      angles('∠F(ax)–Br–F(eq)', 84.8, eq.map((f) => [ax, br, f] as [number, number, number])),
    ],
  };
}

function m9(): Built {
  const b = new Builder();
  const R = 1.42 / (2 * Math.sin(Math.PI / 5));
  const h = Math.sqrt(2.11 * 2.11 - R * R);
  const ni = b.add('Ni', [0, 0, 0]);
  const cs = planarRing(5, 1.42, -h, 0).map((p) => b.add('C', p));
  const hs = cs.map((c) => b.add('H', radialInPlane(P(b.atoms, c), 1.08)));
  const nAt = b.add('N', [0, 0, 1.626]);
  const o = b.add('O', [0, 0, 1.626 + 1.165]);
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.42, cs.map((c, k) => [c, cs[(k + 1) % 5]] as [number, number])),
      bonds('C–H', 1.08, cs.map((c, k) => [c, hs[k]] as [number, number])),
      angles('∠C–C–H (H in plane, radial)', 126, cs.map((c, k) => [cs[(k + 1) % 5], c, hs[k]] as [number, number, number])),
      bonds('Ni–C', 2.11, cs.map((c) => [ni, c] as [number, number])),
      bonds('Ni–N', 1.626, [[ni, nAt]]),
      bonds('N–O', 1.165, [[nAt, o]]),
      angles('∠Ni–N–O linear', 180, [[ni, nAt, o]]),
    ],
  };
}

/** Benzene r_e C–C 1.3914, C–H 1.0802 (table #31), ring in xy, C on the x axis. */
function benzeneInto(b: Builder): { cs: number[]; hs: number[]; checks: GeometryCheck[] } {
  const cs = planarRing(6, 1.3914, 0, 0).map((p) => b.add('C', p));
  const hs = cs.map((c) => b.add('H', radialInPlane(P(b.atoms, c), 1.0802)));
  return {
    cs,
    hs,
    checks: [
      bonds('C–C', 1.3914, cs.map((c, k) => [c, cs[(k + 1) % 6]] as [number, number])),
      bonds('C–H', 1.0802, cs.map((c, k) => [c, hs[k]] as [number, number])),
      angles('∠CCC', 120, cs.map((c, k) => [cs[(k + 5) % 6], c, cs[(k + 1) % 6]] as [number, number, number])),
      angles('∠CCH', 120, cs.map((c, k) => [cs[(k + 1) % 6], c, hs[k]] as [number, number, number])),
    ],
  };
}

function m10(): Built {
  const b = new Builder();
  const { cs, checks } = benzeneInto(b);
  const ar = b.add('Ar', [0, 0, 3.58]);
  return {
    atoms: b.atoms,
    checks: [
      ...checks,
      // Ar 3.58 above the ring centre: Ar–C = √(3.58² + r²) with r = C–C for a hexagon.
      bonds('Ar–C (Ar 3.58 above the ring centre)', Math.hypot(3.58, 1.3914), cs.map((c) => [ar, c] as [number, number])),
    ],
  };
}

function m11(): Built {
  const b = new Builder();
  const n1 = b.add('N', [0.615, 0, 0]);
  const n2 = b.add('N', [-0.615, 0, 0]);
  const f1p = add(P(b.atoms, n1), scale(cone([-1, 0, 0], [0, 1, 0], 105.5, 0), 1.4));
  const f1 = b.add('F', f1p);
  const f2 = b.add('F', scale(f1p, -1));
  return {
    atoms: b.atoms,
    checks: [
      bonds('N=N', 1.23, [[n1, n2]]),
      bonds('N–F', 1.4, [[n1, f1], [n2, f2]]),
      angles('∠NNF', 105.5, [[n2, n1, f1], [n1, n2, f2]]),
      torsions('trans F–N=N–F', 180, [[f1, n1, n2, f2]]),
    ],
  };
}

function m12(): Built {
  const b = new Builder();
  const bo = b.add('B', [0, 0, 0]);
  const os = range(3).map((k) => b.add('O', scale(sph(90, 120 * k), 1.37)));
  // All H turned the same way in the plane (propeller): angle 113° from O→B, counter-clockwise.
  const hs = os.map((o) => b.add('H', add(P(b.atoms, o), scale(cone(scale(P(b.atoms, o), -1), Z, 113, 90), 0.96))));
  return {
    atoms: b.atoms,
    checks: [
      bonds('B–O', 1.37, os.map((o) => [bo, o] as [number, number])),
      bonds('O–H', 0.96, os.map((o, k) => [o, hs[k]] as [number, number])),
      angles('∠BOH', 113, os.map((o, k) => [bo, o, hs[k]] as [number, number, number])),
      { label: 'planar (all z = 0)', expected: 0, actual: (a) => a.map((x) => x.z) },
    ],
  };
}

function m18(): Built {
  const b = new Builder();
  const c0 = b.add('C', [0, 0, 0]);
  const c1 = b.add('C', [0, 0, 1.308]);
  const c2 = b.add('C', [0, 0, -1.308]);
  const s = 1.08 * Math.sin(59.5 * DEG);
  const c = 1.08 * Math.cos(59.5 * DEG);
  const h1 = [b.add('H', [s, 0, 1.308 + c]), b.add('H', [-s, 0, 1.308 + c])];
  const h2 = [b.add('H', [0, s, -1.308 - c]), b.add('H', [0, -s, -1.308 - c])];
  return {
    atoms: b.atoms,
    checks: [
      bonds('C=C', 1.308, [[c0, c1], [c0, c2]]),
      bonds('C–H', 1.08, [[c1, h1[0]], [c1, h1[1]], [c2, h2[0]], [c2, h2[1]]]),
      angles('∠HCH', 119, [[h1[0], c1, h1[1]], [h2[0], c2, h2[1]]]),
      angles('∠C=C=C linear', 180, [[c1, c0, c2]]),
      torsions('CH2 planes perpendicular', 90, [[h1[0], c1, c2, h2[0]]]),
    ],
  };
}

function m20(): Built {
  const b = new Builder();
  // Atoms at azimuths 30 + 60k: the C2 axes then run through bond midpoints on ±x.
  const ring = puckeredRing(6, 1.536, 111.4, 30).map((p) => b.add('C', p));
  const hs: number[][] = ring.map((c, k) => {
    const p = P(b.atoms, c);
    const v1 = unit(sub(P(b.atoms, ring[(k + 5) % 6]), p));
    const v2 = unit(sub(P(b.atoms, ring[(k + 1) % 6]), p));
    const bis = unit(add(v1, v2));
    const nrm = unit(cross(v1, v2));
    const half = (107.5 / 2) * DEG;
    // H–C–H in the plane ⟂ to C–C–C, bisected by it: local C2v at each carbon.
    return [1, -1].map((s) => b.add('H', add(p, scale(add(scale(bis, -Math.cos(half)), scale(nrm, s * Math.sin(half))), 1.121))));
  });
  return {
    atoms: b.atoms,
    checks: [
      bonds('C–C', 1.536, ring.map((c, k) => [c, ring[(k + 1) % 6]] as [number, number])),
      angles('∠CCC', 111.4, ring.map((c, k) => [ring[(k + 5) % 6], c, ring[(k + 1) % 6]] as [number, number, number])),
      bonds('C–H', 1.121, ring.flatMap((c, k) => hs[k].map((h) => [c, h] as [number, number]))),
      angles('∠HCH', 107.5, ring.map((c, k) => [hs[k][0], c, hs[k][1]] as [number, number, number])),
      // The table gives the resulting torsion rounded to 0.01°.
      torsions('ring torsion (derived, table 54.94)', 54.94, ring.map((_, k) => [ring[k], ring[(k + 1) % 6], ring[(k + 2) % 6], ring[(k + 3) % 6]] as [number, number, number, number]), 0.005),
    ],
  };
}

function m21(): Built {
  const b = new Builder();
  // Azimuths 22.5 + 45k put a C2 axis on x (through the midpoints of two opposite S–S bonds).
  const ring = puckeredRing(8, 2.055, 108.0, 22.5).map((p) => b.add('S', p));
  return {
    atoms: b.atoms,
    checks: [
      bonds('S–S', 2.055, ring.map((s, k) => [s, ring[(k + 1) % 8]] as [number, number])),
      angles('∠SSS', 108.0, ring.map((s, k) => [ring[(k + 7) % 8], s, ring[(k + 1) % 8]] as [number, number, number])),
      torsions('ring torsion (derived, table 98.76)', 98.76, ring.map((_, k) => [ring[k], ring[(k + 1) % 8], ring[(k + 2) % 8], ring[(k + 3) % 8]] as [number, number, number, number]), 0.005),
    ],
  };
}

function m27(): Built {
  const b = new Builder();
  const half = 1.335 / 2;
  const a = (180 - 121.7) * DEG;
  const c1 = b.add('C', [0, 0, half]);
  const c2 = b.add('C', [0, 0, -half]);
  const hs = [
    [c1, 1, 1],
    [c1, -1, 1],
    [c2, 1, -1],
    [c2, -1, -1],
  ].map(([c, sy, sz]) => [c, b.add('H', [0, sy * 1.09 * Math.sin(a), sz * (half + 1.09 * Math.cos(a))])]);
  return {
    atoms: b.atoms,
    checks: [
      bonds('C=C', 1.335, [[c1, c2]]),
      bonds('C–H', 1.09, hs as [number, number][]),
      angles('∠CCH', 121.7, hs.map(([c, h]) => [c === c1 ? c2 : c1, c, h] as [number, number, number])),
    ],
  };
}

function m28(): Built {
  const b = new Builder();
  const half = 1.763 / 2;
  const b1 = b.add('B', [0, 0, half]);
  const b2 = b.add('B', [0, 0, -half]);
  const xb = Math.sqrt(1.314 * 1.314 - half * half);
  const hb = [b.add('H', [xb, 0, 0]), b.add('H', [-xb, 0, 0])];
  const a = (121 / 2) * DEG;
  const ht1 = [1, -1].map((s) => b.add('H', [0, s * 1.192 * Math.sin(a), half + 1.192 * Math.cos(a)]));
  const ht2 = [1, -1].map((s) => b.add('H', [0, s * 1.192 * Math.sin(a), -half - 1.192 * Math.cos(a)]));
  return {
    atoms: b.atoms,
    checks: [
      bonds('B–B', 1.763, [[b1, b2]]),
      bonds('B–H(b)', 1.314, hb.flatMap((h) => [[b1, h], [b2, h]] as [number, number][])),
      bonds('B–H(t)', 1.192, [...ht1.map((h) => [b1, h] as [number, number]), ...ht2.map((h) => [b2, h] as [number, number])]),
      angles('∠H(t)BH(t)', 121, [[ht1[0], b1, ht1[1]], [ht2[0], b2, ht2[1]]]),
    ],
  };
}

/** ABn: centre at the origin, ligands at the given unit directions and one length. */
function star(centre: string, ligand: string, length: number, dirs: Vec3[], label: string): Built {
  const b = new Builder();
  const c = b.add(centre, [0, 0, 0]);
  const ls = dirs.map((d) => b.add(ligand, scale(d, length)));
  return { atoms: b.atoms, checks: [bonds(label, length, ls.map((l) => [c, l] as [number, number]))] };
}

function m30(): Built {
  const b = new Builder();
  const p = b.add('P', [0, 0, 0]);
  const ax = [b.add('F', [0, 0, 1.577]), b.add('F', [0, 0, -1.577])];
  const eq = range(3).map((k) => b.add('F', scale(sph(90, 120 * k), 1.534)));
  return {
    atoms: b.atoms,
    checks: [
      bonds('P–F(ax)', 1.577, ax.map((f) => [p, f] as [number, number])),
      bonds('P–F(eq)', 1.534, eq.map((f) => [p, f] as [number, number])),
      angles('∠F(eq)–P–F(eq)', 120, [[eq[0], p, eq[1]], [eq[1], p, eq[2]]]),
      angles('∠F(ax)–P–F(eq)', 90, eq.map((f) => [ax[0], p, f] as [number, number, number])),
    ],
  };
}

function m34(): Built {
  const s4 = closeGroup([improper(Z, 4)]);
  const o0 = scale(TETRAHEDRAL[0], 1.63);
  // H at ∠SiOH 118, turned 40° about the Si–O bond from the plane (O, z): a generic position
  // (not in any σd of the SiO4 tetrahedron), so only S4 survives.
  const h0 = add(o0, scale(cone(scale(o0, -1), Z, 118, 40), 0.96));
  const b = new Builder();
  const si = b.add('Si', [0, 0, 0]);
  const os = s4.map((g) => b.add('O', matVec(g, o0)));
  const hs = s4.map((g) => b.add('H', matVec(g, h0)));
  return {
    atoms: b.atoms,
    checks: [
      { label: 'S4 group order', expected: 4, actual: () => [s4.length] },
      bonds('Si–O', 1.63, os.map((o) => [si, o] as [number, number])),
      bonds('O–H', 0.96, os.map((o, k) => [o, hs[k]] as [number, number])),
      angles('∠SiOH', 118, os.map((o, k) => [si, o, hs[k]] as [number, number, number])),
      angles('∠OSiO tetrahedral', TET, [[os[0], si, os[1]], [os[0], si, os[2]], [os[1], si, os[3]]]),
    ],
  };
}

function m35(): Built {
  const s6 = closeGroup([improper(Z, 6)]);
  const c1: Vec3 = [0, 0, 0.77];
  const o0 = add(c1, scale(sph(180 - TET, 0), 1.43));
  // Generic H (model): O–H 0.96, ∠COH 108.5, turned 50° about C–O — no σd or C2′ survives.
  const h0 = add(o0, scale(cone(sub(c1, o0), Z, 108.5, 50), 0.96));
  const b = new Builder();
  const cs = [b.add('C', c1), b.add('C', scale(c1, -1))];
  const os = s6.map((g) => b.add('O', matVec(g, o0)));
  const hs = s6.map((g) => b.add('H', matVec(g, h0)));
  const carbonOf = (o: number) => (b.atoms[o].z > 0 ? cs[0] : cs[1]);
  return {
    atoms: b.atoms,
    checks: [
      { label: 'S6 group order', expected: 6, actual: () => [s6.length] },
      bonds('C–C', 1.54, [[cs[0], cs[1]]]),
      bonds('C–O', 1.43, os.map((o) => [carbonOf(o), o] as [number, number])),
      angles('∠OCC tetrahedral', TET, os.map((o) => [o, carbonOf(o), carbonOf(o) === cs[0] ? cs[1] : cs[0]] as [number, number, number])),
      bonds('O–H (model)', 0.96, os.map((o, k) => [o, hs[k]] as [number, number])),
      angles('∠COH (model)', 108.5, os.map((o, k) => [carbonOf(o), o, hs[k]] as [number, number, number])),
    ],
  };
}

function m39(): Built {
  const b = new Builder();
  const ps = TETRAHEDRAL.map((d) => b.add('P', scale(d, (2.21 * Math.sqrt(3)) / (2 * Math.sqrt(2)))));
  const pairs: [number, number][] = [];
  for (let i = 0; i < 4; i++) for (let j = i + 1; j < 4; j++) pairs.push([ps[i], ps[j]]);
  return { atoms: b.atoms, checks: [bonds('P–P', 2.21, pairs), angles('∠PPP', 60, [[ps[0], ps[1], ps[2]], [ps[1], ps[2], ps[3]]])] };
}

function m40(): Built {
  const b = new Builder();
  const co = b.add('Co', [0, 0, 0]);
  const half = (118 / 2) * DEG;
  // +x ligand in the xy plane; the cyclic map (x,y,z) → (z,x,y) (C3 about (1,1,1)) carries it to
  // the +y ligand in yz and the +z ligand in zx; the −x, −y, −z ligands are inversion images.
  const base: Vec3[] = [
    [1.95, 0, 0],
    [1.95 + 1.24 * Math.cos(half), 1.24 * Math.sin(half), 0],
    [1.95 + 1.24 * Math.cos(half), -1.24 * Math.sin(half), 0],
  ];
  const cyc = (v: Vec3): Vec3 => [v[2], v[0], v[1]];
  const ligands: number[][] = [];
  for (const inv of [1, -1]) {
    let l = base;
    for (let k = 0; k < 3; k++) {
      ligands.push([b.add('N', scale(l[0], inv)), b.add('O', scale(l[1], inv)), b.add('O', scale(l[2], inv))]);
      l = l.map(cyc);
    }
  }
  return {
    atoms: b.atoms,
    checks: [
      bonds('Co–N', 1.95, ligands.map(([n]) => [co, n] as [number, number])),
      bonds('N–O', 1.24, ligands.flatMap(([n, o1, o2]) => [[n, o1], [n, o2]] as [number, number][])),
      angles('∠ONO', 118, ligands.map(([n, o1, o2]) => [o1, n, o2] as [number, number, number])),
      angles('∠Co–N–O (derived: (360 − 118)/2)', 121, ligands.flatMap(([n, o1, o2]) => [[co, n, o1], [co, n, o2]] as [number, number, number][])),
    ],
  };
}

const OCTAHEDRAL: Vec3[] = [[1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [0, 0, 1], [0, 0, -1]];

function m42(): Built {
  const b = new Builder();
  const c = 1.571 / 2;
  const corners: Vec3[] = [];
  for (const x of [1, -1]) for (const y of [1, -1]) for (const z of [1, -1]) corners.push([x * c, y * c, z * c]);
  const cs = corners.map((p) => b.add('C', p));
  const hs = corners.map((p) => b.add('H', add(p, scale(unit(p), 1.097))));
  const edges: [number, number][] = [];
  for (let i = 0; i < 8; i++) for (let j = i + 1; j < 8; j++) if (Math.abs(dist(corners[i], corners[j]) - 1.571) < 1e-6) edges.push([cs[i], cs[j]]);
  return {
    atoms: b.atoms,
    checks: [
      { label: 'cube edges', expected: 12, actual: () => [edges.length] },
      bonds('C–C', 1.571, edges),
      bonds('C–H', 1.097, cs.map((ci, k) => [ci, hs[k]] as [number, number])),
      angles('∠CCC', 90, [[cs[1], cs[0], cs[2]]]),
    ],
  };
}

function pointSet(group: readonly Mat3[], seed: Vec3, expectedOrder: number): Built {
  const pts = orbit(group, seed);
  const b = new Builder();
  pts.forEach((p) => b.add('C', p));
  const r = Math.hypot(...seed);
  return {
    atoms: b.atoms,
    checks: [
      { label: 'group order', expected: expectedOrder, actual: () => [group.length] },
      { label: 'orbit size (free orbit)', expected: expectedOrder, actual: (a) => [a.length] },
      { label: 'every point at |seed|', expected: r, actual: (a) => a.map((x) => Math.hypot(x.x, x.y, x.z)) },
      { label: 'proper rotations only (det = +1)', expected: 1, actual: () => group.map((g) => Math.round(1e12 * (g[0] * (g[4] * g[8] - g[5] * g[7]) - g[1] * (g[3] * g[8] - g[5] * g[6]) + g[2] * (g[3] * g[7] - g[4] * g[6]))) / 1e12) },
    ],
  };
}

function m45(): Built {
  const r56 = 1.458;
  const r66 = 1.401;
  const a = 2 * r56 + r66;
  const t = r56 / a;
  const v = icosahedronVertices(a / 2);
  const b = new Builder();
  const edges: [number, number][] = [];
  for (let i = 0; i < 12; i++) for (let j = i + 1; j < 12; j++) if (Math.abs(dist(v[i], v[j]) - a) < 1e-9) edges.push([i, j]);
  for (const [i, j] of edges) {
    b.add('C', add(v[i], scale(sub(v[j], v[i]), t)));
    b.add('C', add(v[j], scale(sub(v[i], v[j]), t)));
  }
  const near = (atoms: readonly Atom[], lo: number, hi: number) => {
    const out: number[] = [];
    for (let i = 0; i < atoms.length; i++)
      for (let j = i + 1; j < atoms.length; j++) {
        const d = dist(pos(atoms[i]), pos(atoms[j]));
        if (d > lo && d < hi) out.push(d);
      }
    return out;
  };
  return {
    atoms: b.atoms,
    checks: [
      { label: 'icosahedron edges', expected: 30, actual: () => [edges.length] },
      { label: 'number of 5-6 bonds', expected: 60, actual: (x) => [near(x, 1.43, 1.5).length] },
      { label: 'number of 6-6 bonds', expected: 30, actual: (x) => [near(x, 1.3, 1.43).length] },
      { label: 'r(5-6)', expected: r56, actual: (x) => near(x, 1.43, 1.5) },
      { label: 'r(6-6)', expected: r66, actual: (x) => near(x, 1.3, 1.43) },
      // Table: "a built diameter of 7.124" (rounded to 1e-3).
      { label: 'diameter (table 7.124)', expected: 7.124, actual: (x) => [2 * Math.max(...x.map((p) => Math.hypot(p.x, p.y, p.z)))], tolerance: 5e-4 },
    ],
  };
}

function m46(): Built {
  const v = icosahedronVertices(1.78 / 2);
  const b = new Builder();
  const bs = v.map((p) => b.add('B', p));
  const hs = v.map((p) => b.add('H', add(p, scale(unit(p), 1.12))));
  const edges: [number, number][] = [];
  for (let i = 0; i < 12; i++) for (let j = i + 1; j < 12; j++) if (Math.abs(dist(v[i], v[j]) - 1.78) < 1e-9) edges.push([bs[i], bs[j]]);
  return {
    atoms: b.atoms,
    checks: [
      { label: 'icosahedron edges', expected: 30, actual: () => [edges.length] },
      bonds('B–B', 1.78, edges),
      bonds('B–H (radial)', 1.12, bs.map((bb, k) => [bb, hs[k]] as [number, number])),
    ],
  };
}

function linear(els: [string, number][], bondsSpec: [string, number, number, number][]): Built {
  const b = new Builder();
  els.forEach(([el, z]) => b.add(el, [0, 0, z]));
  return { atoms: b.atoms, checks: bondsSpec.map(([l, r, i, j]) => bonds(l, r, [[i, j]])) };
}

const ENTRIES: Entry[] = [
  { id: 1, name: 'CHFClBr (bromochlorofluoromethane)', pointGroup: 'C1', pointGroupSource: 'textbook: 4 different substituents (memory)', geometrySource: 'model (typical lengths, memory)', formula: 'CHBrClF', charge: 0, build: m1 },
  { id: 2, name: 'HOCl', pointGroup: 'Cs', pointGroupSource: 'planar triatomic (trivial)', geometrySource: 'memory, approx.', formula: 'ClHO', charge: 0, build: m2 },
  { id: 3, name: 'meso-CHFCl–CHFCl, anti conformer', pointGroup: 'Ci', pointGroupSource: 'textbook-type example (memory)', geometrySource: 'model', formula: 'C2H2Cl2F2', charge: 0, build: m3 },
  { id: 4, name: 'hydrogen peroxide', pointGroup: 'C2', pointGroupSource: 'verified (encyclopedia text: "nonplanar … C2 symmetry")', geometrySource: 'classic gas-phase values as quoted on a study page (verified), originally Redington, Olson & Cross, J. Chem. Phys. 36, 1311 (1962) (citation from memory)', formula: 'H2O2', charge: 0, build: m4 },
  { id: 5, name: 'CH3–CF3 twisted 30° from eclipsed', pointGroup: 'C3', pointGroupSource: 'constructed (no σv, no C2′ because the two ends differ)', geometrySource: 'model, non-equilibrium', formula: 'C2H3F3', charge: 0, build: m5 },
  { id: 6, name: 'water', pointGroup: 'C2v', pointGroupSource: 'verified (CCCBDB: C2v)', geometrySource: 'verified: NIST CCCBDB (SRD 101, Rel. 22), citing Hoy & Bunker, J. Mol. Spectrosc. 74, 1 (1979)', formula: 'H2O', charge: 0, build: m6 },
  { id: 7, name: 'ammonia', pointGroup: 'C3v', pointGroupSource: 'verified (CCCBDB: C3V)', geometrySource: 'verified: CCCBDB citing Herzberg (1966)', formula: 'H3N', charge: 0, build: m7 },
  { id: 8, name: 'BrF5', pointGroup: 'C4v', pointGroupSource: 'textbook VSEPR example (memory)', geometrySource: 'memory, uncertain (gas ED/MW literature ~1970s)', formula: 'BrF5', charge: 0, build: m8 },
  { id: 9, name: 'CpNiNO (η5-C5H5)Ni(NO)', pointGroup: 'C5v', pointGroupSource: 'memory (linear Ni–N–O on the C5 axis)', geometrySource: 'model / memory, approx. Weakest entry', formula: 'C5H5NNiO', charge: 0, build: m9 },
  { id: 10, name: 'benzene···Ar van der Waals complex', pointGroup: 'C6v', pointGroupSource: 'memory (Ar on the C6 axis, from microwave work)', geometrySource: 'memory, approx.', formula: 'C6H6Ar', charge: 0, build: m10 },
  { id: 11, name: 'trans-N2F2', pointGroup: 'C2h', pointGroupSource: 'verified (encyclopedia text: trans = C2h, cis = C2v)', geometrySource: 'memory, approx. (ED values in the literature differ by about 0.01 Å)', formula: 'F2N2', charge: 0, build: m11 },
  { id: 12, name: 'boric acid B(OH)3, planar propeller', pointGroup: 'C3h', pointGroupSource: 'memory', geometrySource: 'memory/model, approx.', formula: 'BH3O3', charge: 0, build: m12 },
  { id: 13, name: 'biphenyl (gas phase, twisted 44.4°)', pointGroup: 'D2', pointGroupSource: 'memory', geometrySource: 'twist 44.4: Almenningen et al., J. Mol. Struct. 128, 59 (1985) (memory). Other lengths approx. (memory)', formula: 'C12H10', charge: 0, build: () => biphenyl(44.4) },
  { id: 14, name: 'ethane twisted 30°', pointGroup: 'D3', pointGroupSource: 'constructed', geometrySource: 'model', formula: 'C2H6', charge: 0, build: () => ethane(30) },
  { id: 15, name: '[Re2Cl8]2−, eclipsed', pointGroup: 'D4h', pointGroupSource: 'memory', geometrySource: 'memory (Cotton & Harris, Inorg. Chem. 4, 330 (1965))', formula: 'Cl8Re2', charge: -2, build: () => re2cl8(0) },
  { id: 16, name: 'Re2Cl8 twisted 20°', pointGroup: 'D4', pointGroupSource: 'constructed from #15', geometrySource: 'model', formula: 'Cl8Re2', charge: -2, build: () => re2cl8(20) },
  { id: 17, name: 'Re2Cl8 staggered 45°', pointGroup: 'D4d', pointGroupSource: 'constructed from #15', geometrySource: 'model', formula: 'Cl8Re2', charge: -2, build: () => re2cl8(45) },
  { id: 18, name: 'allene', pointGroup: 'D2d', pointGroupSource: 'verified (CCCBDB: D2D)', geometrySource: 'verified: IR study of allene-1,1-d2 (abstract: r0 CH 1.080, CC 1.308, HCH 119°)', formula: 'C3H4', charge: 0, build: m18 },
  { id: 19, name: 'ethane, staggered', pointGroup: 'D3d', pointGroupSource: 'verified (CCCBDB: D3D)', geometrySource: 'memory (r_e-type, approx.)', formula: 'C2H6', charge: 0, build: () => ethane(60) },
  { id: 20, name: 'cyclohexane, chair', pointGroup: 'D3d', pointGroupSource: 'textbook (memory)', geometrySource: 'memory (ED r_g values, approx.)', formula: 'C6H12', charge: 0, build: m20 },
  { id: 21, name: 'S8 (crown)', pointGroup: 'D4d', pointGroupSource: 'textbook (memory)', geometrySource: 'memory (α-S8 crystal values, approx.)', formula: 'S8', charge: 0, build: m21 },
  { id: 22, name: 'ferrocene, staggered', pointGroup: 'D5d', pointGroupSource: 'textbook', geometrySource: 'Fe–C and C–C verified (gas ED abstract, "D5d model"); C–H from memory', formula: 'C10H10Fe', charge: 0, build: () => sandwich('Fe', 5, 2.064, 1.44, 1.104, 36) },
  { id: 23, name: 'ferrocene, eclipsed', pointGroup: 'D5h', pointGroupSource: 'verified: gas-phase ED gives eclipsed (Haaland & Nilsson, Acta Chem. Scand. 22, 2653 (1968))', geometrySource: 'as #22', formula: 'C10H10Fe', charge: 0, build: () => sandwich('Fe', 5, 2.064, 1.44, 1.104, 0) },
  { id: 24, name: 'bis(benzene)chromium, eclipsed', pointGroup: 'D6h', pointGroupSource: 'memory', geometrySource: 'memory (gas ED, Haaland 1965), approx.', formula: 'C12H12Cr', charge: 0, build: () => sandwich('Cr', 6, 2.15, 1.423, 1.09, 0) },
  { id: 25, name: 'bis(benzene)chromium, staggered', pointGroup: 'D6d', pointGroupSource: 'constructed (hypothetical conformer)', geometrySource: 'model', formula: 'C12H12Cr', charge: 0, build: () => sandwich('Cr', 6, 2.15, 1.423, 1.09, 30) },
  { id: 26, name: 'uranocene U(C8H8)2, eclipsed', pointGroup: 'D8h', pointGroupSource: 'memory', geometrySource: 'memory (crystal, Avdeef et al. 1972), approx.', formula: 'C16H16U', charge: 0, build: () => sandwich('U', 8, 2.647, 1.392, 1.08, 0) },
  { id: 27, name: 'ethylene', pointGroup: 'D2h', pointGroupSource: 'textbook', geometrySource: 'verified: Kuchitsu, J. Chem. Phys. 44, 906 (1966) (abstract)', formula: 'C2H4', charge: 0, build: m27 },
  { id: 28, name: 'diborane B2H6', pointGroup: 'D2h', pointGroupSource: 'verified (several textbook Q&A pages: D2h)', geometrySource: 'memory, approx.', formula: 'B2H6', charge: 0, build: m28 },
  { id: 29, name: 'BF3', pointGroup: 'D3h', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'BF3', charge: 0, build: () => star('B', 'F', 1.307, range(3).map((k) => sph(90, 120 * k)), 'B–F') },
  { id: 30, name: 'PF5', pointGroup: 'D3h', pointGroupSource: 'verified (encyclopedia table: D3h)', geometrySource: 'memory (ED, Hansen & Bartell 1965)', formula: 'F5P', charge: 0, build: m30 },
  {
    id: 31, name: 'benzene', pointGroup: 'D6h', pointGroupSource: 'verified (CCCBDB: D6H)', geometrySource: 'verified: Gauss & Stanton, J. Phys. Chem. A 104, 2865 (2000)', formula: 'C6H6', charge: 0,
    build: () => {
      const b = new Builder();
      const { checks } = benzeneInto(b);
      return { atoms: b.atoms, checks };
    },
  },
  { id: 32, name: 'ethane, eclipsed', pointGroup: 'D3h', pointGroupSource: 'constructed', geometrySource: 'model', formula: 'C2H6', charge: 0, build: () => ethane(0) },
  { id: 33, name: 'XeF4', pointGroup: 'D4h', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'F4Xe', charge: 0, build: () => star('Xe', 'F', 1.953, range(4).map((k) => sph(90, 90 * k)), 'Xe–F') },
  { id: 34, name: 'Si(OH)4, S4 conformer', pointGroup: 'S4', pointGroupSource: 'constructed (orbit of one O and one H under S4)', geometrySource: 'model', formula: 'H4O4Si', charge: 0, build: m34 },
  { id: 35, name: 'C2(OH)6, S6 conformer', pointGroup: 'S6', pointGroupSource: 'constructed (orbit under S6)', geometrySource: 'model (hypothetical molecule)', formula: 'C2H6O6', charge: 0, build: m35 },
  { id: 36, name: 'neopentane, each CH3 turned 20° from the Td position', pointGroup: 'T', pointGroupSource: 'constructed (rotations kept, σd/S4 removed)', geometrySource: 'model', formula: 'C5H12', charge: 0, build: () => neopentane(20) },
  { id: 37, name: 'methane', pointGroup: 'Td', pointGroupSource: 'textbook', geometrySource: 'a study page quotes 1.085 from Gray & Robiette, Mol. Phys. 37, 1901 (1979) (verified); the 4th digit is from memory', formula: 'CH4', charge: 0, build: () => withTetAngles(star('C', 'H', 1.0858, TETRAHEDRAL, 'C–H')) },
  { id: 38, name: 'CCl4', pointGroup: 'Td', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'CCl4', charge: 0, build: () => withTetAngles(star('C', 'Cl', 1.767, TETRAHEDRAL, 'C–Cl')) },
  { id: 39, name: 'P4', pointGroup: 'Td', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'P4', charge: 0, build: m39 },
  { id: 40, name: '[Co(NO2)6]3−, idealized', pointGroup: 'Th', pointGroupSource: 'memory: each NO2 lies in one coordinate mirror plane, assigned cyclically', geometrySource: 'memory/model', formula: 'CoN6O12', charge: -3, build: m40 },
  { id: 41, name: 'SF6', pointGroup: 'Oh', pointGroupSource: 'textbook', geometrySource: 'memory (ED)', formula: 'F6S', charge: 0, build: () => star('S', 'F', 1.561, OCTAHEDRAL, 'S–F') },
  { id: 42, name: 'cubane', pointGroup: 'Oh', pointGroupSource: 'textbook', geometrySource: 'memory (gas ED, Hedberg et al. 1991)', formula: 'C8H8', charge: 0, build: m42 },
  { id: 43, name: '24-point set, orbit of (0.45, 1.1, 2.3) under O', pointGroup: 'O', pointGroupSource: 'constructed (snub-cube type)', geometrySource: 'model, not a molecule', formula: 'C24', charge: 0, build: () => pointSet(GROUP_O, [0.45, 1.1, 2.3], 24) },
  { id: 44, name: '60-point set, orbit of (0.3, 0.8, 3.1) under I', pointGroup: 'I', pointGroupSource: 'constructed (snub-dodecahedron type)', geometrySource: 'model, not a molecule', formula: 'C60', charge: 0, build: () => pointSet(GROUP_I, [0.3, 0.8, 3.1], 60) },
  { id: 45, name: 'C60', pointGroup: 'Ih', pointGroupSource: 'verified (the ED paper says the data are consistent with icosahedral symmetry)', geometrySource: 'verified: Hedberg et al., Science 254, 410 (1991)', formula: 'C60', charge: 0, build: m45 },
  { id: 46, name: '[B12H12]2−', pointGroup: 'Ih', pointGroupSource: 'verified (tutorial page example)', geometrySource: 'memory, approx.', formula: 'B12H12', charge: -2, build: m46 },
  { id: 47, name: 'HCN', pointGroup: 'C∞v', pointGroupSource: 'verified (CCCBDB "C*V", for the cation entry)', geometrySource: 'memory', formula: 'CHN', charge: 0, build: () => linear([['H', -1.0655], ['C', 0], ['N', 1.1532]], [['C–H', 1.0655, 0, 1], ['C≡N', 1.1532, 1, 2]]) },
  { id: 48, name: 'CO2', pointGroup: 'D∞h', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'CO2', charge: 0, build: () => linear([['O', -1.16], ['C', 0], ['O', 1.16]], [['C=O', 1.16, 0, 1], ['C=O', 1.16, 1, 2]]) },
  { id: 49, name: 'acetylene', pointGroup: 'D∞h', pointGroupSource: 'textbook', geometrySource: 'memory', formula: 'C2H2', charge: 0, build: () => linear([['H', -0.6013 - 1.0622], ['C', -0.6013], ['C', 0.6013], ['H', 0.6013 + 1.0622]], [['C–H', 1.0622, 0, 1], ['C≡C', 1.2026, 1, 2], ['C–H', 1.0622, 2, 3]]) },
];

function withTetAngles(built: Built): Built {
  const pairs: [number, number, number][] = [];
  for (let i = 1; i < 5; i++) for (let j = i + 1; j < 5; j++) pairs.push([i, 0, j]);
  return { atoms: built.atoms, checks: [...built.checks, angles('∠ tetrahedral', TET, pairs)] };
}

/** All 49 reference molecules, built once, in table order. */
export const REFERENCE_MOLECULES: ReferenceMolecule[] = ENTRIES.map(({ build, ...rest }) => {
  const { atoms, checks } = build();
  return { ...rest, atoms, checks };
});

/** Look up a reference molecule by its table number. */
export function referenceMolecule(id: number): ReferenceMolecule {
  const m = REFERENCE_MOLECULES.find((r) => r.id === id);
  if (!m) throw new Error(`no reference molecule #${id}`);
  return m;
}

