import type { OperationJson } from '../contracts/structure';
import { groupFamily, type IdealGroup } from './groups';
import { axisAngle3, canonicalDirection, dot3, mul33, transpose3, type Mat3, type Vec3 } from './mat3';
import { gcd } from './operations';

/** Label and geometry of one element in the standard frame. */
export interface ElementLabel {
  symbol: string;
  kind: OperationJson['kind'];
  order: number;
  power: number;
  /** Unit axis / normal in the standard frame, sign-canonical; [0,0,0] for E and i. */
  axis: Vec3;
  /** Plane class for reflections. */
  planeKind?: 'σh' | 'σv' | 'σd' | 'σ';
}

const near = (a: Vec3, b: Vec3) => Math.abs(Math.abs(dot3(a, b)) - 1) < 1e-6;
const X: Vec3 = [1, 0, 0];
const Y: Vec3 = [0, 1, 0];
const Z: Vec3 = [0, 0, 1];

/**
 * Schoenflies labels of a group's elements once it is in the standard frame (matrices S·D·Sᵀ):
 * `E`, `Cn`, `Cn^k` (k reduced: C6^2 is written C3), `C2′`/`C2″` for the two classes of C₂ ⊥ the
 * principal axis (C2′ = the class containing the C₂ on x), `i`, `Sn^k`, and mirrors σh (⊥ the
 * principal axis), σv/σd (containing it: σv = the class containing the xz plane, σd the other;
 * in Dₙd and Td all are σd; in C2v and D2h the two vertical planes are σv and σv′), σ for Ih.
 * Powers are counted counter-clockwise about the sign-canonical axis.
 */
export function labelElements(name: string, ideal: IdealGroup, S: Mat3): readonly ElementLabel[] {
  // Groups whose frame is fixed by their elements reach only a few distinct frames S (discrete
  // choices), so their labels are remembered per group and frame (entries rounded far below any
  // geometric meaning). Where the elements leave a free turn (fixed by the inertia axes or a
  // reference atom, orient.ts), S differs for every structure: an entry would never be used
  // again and would only keep garbage alive.
  if (FREE_FRAME.has(groupFamily(name).family)) return computeLabels(name, ideal, S);
  let key = name;
  for (let k = 0; k < 9; k++) key += `,${Math.round(S[k] * 1e12)}`;
  const hit = labelCache.get(key);
  if (hit) return hit;
  const labels = computeLabels(name, ideal, S);
  if (labelCache.size >= 4096) labelCache.clear();
  labelCache.set(key, labels);
  return labels;
}

const labelCache = new Map<string, readonly ElementLabel[]>();

/** Families whose elements leave the standard frame a free rotation (about z; any for C1 and Ci). */
const FREE_FRAME: ReadonlySet<string> = new Set(['C1', 'Ci', 'Cs', 'Cn', 'Cnh', 'S2n']);

function computeLabels(name: string, ideal: IdealGroup, S: Mat3): ElementLabel[] {
  const St = transpose3(S);
  const std = ideal.elements.map((e) => mul33(S, e.matrix, St));
  const fam = groupFamily(name).family;
  const n = groupFamily(name).n;
  const classOfAxis = (want: Vec3, kind: 'rotation2' | 'reflection'): number => {
    for (let k = 0; k < std.length; k++) {
      const e = ideal.elements[k];
      const ok = kind === 'rotation2' ? e.kind === 'rotation' && e.order === 2 : e.kind === 'reflection';
      if (ok && near(axisOf(std[k], e.kind), want)) return ideal.classOf[k];
    }
    return -1;
  };
  const dihedral = fam === 'Dn' || fam === 'Dnh' || fam === 'Dnd';
  const primeClass = dihedral && !(n === 2 && fam !== 'Dnd') ? classOfAxis(X, 'rotation2') : -1;
  const sigmaVClass = classOfAxis(Y, 'reflection');
  return ideal.elements.map((e, k) => {
    const m = std[k];
    if (e.kind === 'identity') return { symbol: 'E', kind: 'identity', order: 1, power: 1, axis: [0, 0, 0] };
    if (e.kind === 'inversion') return { symbol: 'i', kind: 'inversion', order: 2, power: 1, axis: [0, 0, 0] };
    const axis = canonicalDirection(axisOf(m, e.kind));
    if (e.kind === 'rotation') {
      const { axis: a, angle } = axisAngle3(m);
      const theta = dot3(a, axis) >= 0 ? angle : 2 * Math.PI - angle;
      const order = e.order;
      const power = ((Math.round((theta * order) / (2 * Math.PI)) % order) + order) % order;
      let symbol = `C${order}${power > 1 ? `^${power}` : ''}`;
      if (order === 2 && primeClass >= 0 && !near(axis, Z)) {
        symbol = ideal.classOf[k] === primeClass ? 'C2′' : 'C2″';
      } else if (order === 2 && (fam === 'O' || fam === 'Oh') && !near(axis, X) && !near(axis, Y) && !near(axis, Z)) {
        symbol = 'C2′';
      }
      return { symbol, kind: 'rotation', order, power, axis };
    }
    if (e.kind === 'reflection') {
      const planeKind = mirrorKind(fam, n, axis, ideal.classOf[k], sigmaVClass);
      const symbol = planeKind === 'σv' && (name === 'C2v' || name === 'D2h') && near(axis, X) ? 'σv′' : planeKind;
      return { symbol, kind: 'reflection', order: 1, power: 1, axis, planeKind };
    }
    // improper Sn^k: M = Rot(a, φ)·σ_a, so −M = Rot(a, φ + π)
    const { axis: a, angle: psi } = axisAngle3(m.map((v) => -v));
    const psiSigned = dot3(a, axis) >= 0 ? psi : -psi;
    let phi = psiSigned - Math.PI;
    phi = ((phi % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
    const j = Math.round((phi * e.order) / (2 * Math.PI)) % e.order;
    const g = gcd(j, e.order);
    const p = j / g;
    const q = e.order / g;
    const order = q;
    const power = p % 2 === 1 ? p : p + q;
    return { symbol: `S${order}${power > 1 ? `^${power}` : ''}`, kind: 'improper', order, power, axis };
  });
}

function axisOf(m: Mat3, kind: string): Vec3 {
  if (kind === 'rotation') return axisAngle3(m).axis;
  return axisAngle3(m.map((v) => -v)).axis;
}

function mirrorKind(fam: string, n: number, normal: Vec3, cls: number, sigmaVClass: number): 'σh' | 'σv' | 'σd' | 'σ' {
  switch (fam) {
    case 'Cs':
    case 'Cnh':
      return 'σh';
    case 'Th':
      return 'σh';
    case 'Td':
    case 'Dnd':
      return 'σd';
    case 'Oh':
      return near(normal, X) || near(normal, Y) || near(normal, Z) ? 'σh' : 'σd';
    case 'Ih':
      return 'σ';
    case 'Cnv':
    case 'Dnh':
      if (near(normal, Z)) return 'σh';
      if (n % 2 === 1 || n === 2) return 'σv';
      return cls === sigmaVClass ? 'σv' : 'σd';
    default:
      return 'σ';
  }
}
