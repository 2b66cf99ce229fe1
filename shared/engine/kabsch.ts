import type { Mat3 } from './mat3';
import { f64 } from './arena';
import { topEigenvector } from './symmetric-eigen';

/**
 * Optimal superposition (orthogonal Procrustes). The rotation is found with Horn's unit-quaternion
 * method (Horn, J. Opt. Soc. Am. A 4, 629 (1987)), which gives the same minimiser as Kabsch's SVD
 * form (Kabsch, Acta Cryst. A32, 922 (1976); A34, 827 (1978)) and is always a proper rotation.
 * The best improper matrix follows from the proper one: |−R′p − q|² = |R′p + q|², so it is
 * −(best rotation of p onto −q).
 */

/**
 * Correlation matrix S = Σ wᵢ pᵢ qᵢᵀ (row-major; S[3a+b] = Σ w p_a q_b) of two coordinate arrays
 * (x0,y0,z0,x1,…) of equal length, with optional index maps: atom i of p is paired with atom
 * `map[i]` of q.
 */
export function correlation(
  p: ArrayLike<number>,
  q: ArrayLike<number>,
  map?: ArrayLike<number>,
  weights?: ArrayLike<number>,
): Mat3 {
  const s = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  const n = p.length / 3;
  for (let i = 0; i < n; i++) {
    const j = map ? map[i] : i;
    const w = weights ? weights[i] : 1;
    const px = p[3 * i] * w;
    const py = p[3 * i + 1] * w;
    const pz = p[3 * i + 2] * w;
    const qx = q[3 * j];
    const qy = q[3 * j + 1];
    const qz = q[3 * j + 2];
    s[0] += px * qx;
    s[1] += px * qy;
    s[2] += px * qz;
    s[3] += py * qx;
    s[4] += py * qy;
    s[5] += py * qz;
    s[6] += pz * qx;
    s[7] += pz * qy;
    s[8] += pz * qz;
  }
  return s;
}

/** The proper rotation R maximising Σ qᵢ·(R pᵢ) for the correlation S = Σ pᵢ qᵢᵀ (Horn 1987). */
export function rotationFromCorrelation(s: readonly number[]): Mat3 {
  const sxx = s[0], sxy = s[1], sxz = s[2];
  const syx = s[3], syy = s[4], syz = s[5];
  const szx = s[6], szy = s[7], szz = s[8];
  // Horn's 4×4 matrix and its top eigenvector in scratch arrays (this runs for every fit).
  const n = hornScratch;
  n[0] = sxx + syy + szz; n[1] = syz - szy; n[2] = szx - sxz; n[3] = sxy - syx;
  n[4] = syz - szy; n[5] = sxx - syy - szz; n[6] = sxy + syx; n[7] = szx + sxz;
  n[8] = szx - sxz; n[9] = sxy + syx; n[10] = -sxx + syy - szz; n[11] = syz + szy;
  n[12] = sxy - syx; n[13] = szx + sxz; n[14] = syz + szy; n[15] = -sxx - syy + szz;
  const q = quaternionScratch;
  topEigenvector(n, 4, q);
  const q0 = q[0], q1 = q[1], q2 = q[2], q3 = q[3];
  return [
    q0 * q0 + q1 * q1 - q2 * q2 - q3 * q3, 2 * (q1 * q2 - q0 * q3), 2 * (q1 * q3 + q0 * q2),
    2 * (q1 * q2 + q0 * q3), q0 * q0 - q1 * q1 + q2 * q2 - q3 * q3, 2 * (q2 * q3 - q0 * q1),
    2 * (q1 * q3 - q0 * q2), 2 * (q2 * q3 + q0 * q1), q0 * q0 - q1 * q1 - q2 * q2 + q3 * q3,
  ];
}

const hornScratch = new Float64Array(16);
const quaternionScratch = new Float64Array(4);

/**
 * The orthogonal matrix of determinant `det` (+1 rotation, −1 improper) that best maps the
 * p-points onto the q-points in the least-squares sense, given their correlation S = Σ pᵢ qᵢᵀ.
 */
export function orthogonalFromCorrelation(s: readonly number[], det: 1 | -1): Mat3 {
  if (det === 1) return rotationFromCorrelation(s);
  const r = rotationFromCorrelation(s.map((v) => -v));
  return r.map((v) => -v);
}

/**
 * Kabsch superposition of coordinate set `p` onto `q` (same atom order), each about its own
 * unweighted centroid. Returns the rotation, the centroids and the per-atom distances after
 * superposition (Å) and their RMS.
 */
export function superpose(
  p: ArrayLike<number>,
  q: ArrayLike<number>,
): { rotation: Mat3; rmsd: number; distances: number[]; centroidP: number[]; centroidQ: number[] } {
  const n = p.length / 3;
  let px = 0;
  let py = 0;
  let pz = 0;
  let qx = 0;
  let qy = 0;
  let qz = 0;
  for (let i = 0; i < n; i++) {
    px += p[3 * i] / n;
    py += p[3 * i + 1] / n;
    pz += p[3 * i + 2] / n;
    qx += q[3 * i] / n;
    qy += q[3 * i + 1] / n;
    qz += q[3 * i + 2] / n;
  }
  const cp = [px, py, pz];
  const cq = [qx, qy, qz];
  const pc = f64(3 * n);
  const qc = f64(3 * n);
  for (let i = 0; i < n; i++) {
    pc[3 * i] = p[3 * i] - px;
    pc[3 * i + 1] = p[3 * i + 1] - py;
    pc[3 * i + 2] = p[3 * i + 2] - pz;
    qc[3 * i] = q[3 * i] - qx;
    qc[3 * i + 1] = q[3 * i + 1] - qy;
    qc[3 * i + 2] = q[3 * i + 2] - qz;
  }
  const r = rotationFromCorrelation(correlation(pc, qc));
  const distances: number[] = []; // pushed, so packed (see mul3)
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const x = pc[3 * i];
    const y = pc[3 * i + 1];
    const z = pc[3 * i + 2];
    const dx = r[0] * x + r[1] * y + r[2] * z - qc[3 * i];
    const dy = r[3] * x + r[4] * y + r[5] * z - qc[3 * i + 1];
    const dz = r[6] * x + r[7] * y + r[8] * z - qc[3 * i + 2];
    const d2 = dx * dx + dy * dy + dz * dz;
    distances.push(Math.sqrt(d2));
    sum += d2;
  }
  return { rotation: r, rmsd: Math.sqrt(sum / n), distances, centroidP: cp, centroidQ: cq };
}
