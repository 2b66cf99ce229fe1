import type { Mat3 } from './mat3';
import { f64 } from './arena';

/**
 * The group average (Reynolds projector) of a configuration: x̄ᵢ = (1/|G|) Σ_g D(g)ᵀ x_{π_g(i)},
 * "fold every image of atom i back onto atom i and average" (Zabrodsky, Peleg & Avnir, J. Am.
 * Chem. Soc. 114, 7843 (1992); the Reynolds operator, Serre 1977 §2.6). For an orthogonal
 * representation this is the orthogonal projector onto the G-symmetric configurations, so the
 * result is the nearest exactly symmetric structure (Euclidean norm) for these matrices and
 * permutations, and projecting twice changes nothing. Coordinates centred on the fixed point.
 */
export function projectOntoGroup(
  z: ArrayLike<number>,
  matrices: readonly Mat3[],
  perms: readonly Int32Array[],
): Float64Array {
  const n = z.length / 3;
  const out = f64(3 * n);
  const g = matrices.length;
  for (let k = 0; k < g; k++) {
    const m = matrices[k];
    const p = perms[k];
    for (let i = 0; i < n; i++) {
      const j = 3 * p[i];
      const x = z[j];
      const y = z[j + 1];
      const w = z[j + 2];
      // Dᵀ·v: column-wise
      out[3 * i] += m[0] * x + m[3] * y + m[6] * w;
      out[3 * i + 1] += m[1] * x + m[4] * y + m[7] * w;
      out[3 * i + 2] += m[2] * x + m[5] * y + m[8] * w;
    }
  }
  const inv = 1 / g;
  for (let i = 0; i < 3 * n; i++) out[i] *= inv;
  return out;
}

/**
 * RMS over operations and atoms of |D(g) xᵢ − x_{π_g(i)}| (Å): how far a configuration is from
 * being invariant under the given operations. 0 for an exactly symmetric one.
 */
export function symmetryRmsd(x: ArrayLike<number>, matrices: readonly Mat3[], perms: readonly Int32Array[]): number {
  const n = x.length / 3;
  let sum = 0;
  for (let k = 0; k < matrices.length; k++) {
    const m = matrices[k];
    const p = perms[k];
    for (let i = 0; i < n; i++) {
      const a = x[3 * i];
      const b = x[3 * i + 1];
      const c = x[3 * i + 2];
      const j = 3 * p[i];
      const dx = m[0] * a + m[1] * b + m[2] * c - x[j];
      const dy = m[3] * a + m[4] * b + m[5] * c - x[j + 1];
      const dz = m[6] * a + m[7] * b + m[8] * c - x[j + 2];
      sum += dx * dx + dy * dy + dz * dz;
    }
  }
  const count = matrices.length * n;
  return count ? Math.sqrt(sum / count) : 0;
}
