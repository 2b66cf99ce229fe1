import { symmetricEigen } from './symmetric-eigen';
import type { Vec3 } from './mat3';

/**
 * Principal moments and axes of a point set about the origin: the eigen-decomposition of the
 * inertia tensor I = Σ wᵢ (|rᵢ|² 1 − rᵢ rᵢᵀ) (weights = masses for the molecular tensor, 1 for
 * a shell of atoms). Moments ascending, axes unit vectors matching them. `atoms` restricts the
 * sum to a subset.
 */
export function principalAxes(
  y: Float64Array,
  weights: ArrayLike<number> | null,
  atoms?: ArrayLike<number>,
): { moments: number[]; axes: Vec3[] } {
  let xx = 0;
  let yy = 0;
  let zz = 0;
  let xy = 0;
  let xz = 0;
  let yz = 0;
  const count = atoms ? atoms.length : y.length / 3;
  for (let k = 0; k < count; k++) {
    const i = atoms ? atoms[k] : k;
    const w = weights ? weights[i] : 1;
    const x = y[3 * i];
    const v = y[3 * i + 1];
    const z = y[3 * i + 2];
    xx += w * x * x;
    yy += w * v * v;
    zz += w * z * z;
    xy += w * x * v;
    xz += w * x * z;
    yz += w * v * z;
  }
  const tensor = [yy + zz, -xy, -xz, -xy, xx + zz, -yz, -xz, -yz, xx + yy];
  const { values, vectors } = symmetricEigen(tensor, 3);
  return { moments: values, axes: vectors.map((v) => [v[0], v[1], v[2]] as Vec3) };
}

/**
 * Direction of the best line through the origin (largest-variance axis of the unweighted
 * scatter Σ rᵢ rᵢᵀ) and the largest distance of an atom from it (Å).
 */
export function bestLine(y: Float64Array): { direction: Vec3; maxDistance: number } {
  const { axes } = principalAxes(y, null);
  const u = axes[0]; // smallest moment of inertia = largest spread
  let worst = 0;
  const n = y.length / 3;
  for (let i = 0; i < n; i++) {
    const x = y[3 * i];
    const v = y[3 * i + 1];
    const z = y[3 * i + 2];
    const t = x * u[0] + v * u[1] + z * u[2];
    const d2 = x * x + v * v + z * z - t * t;
    if (d2 > worst) worst = d2;
  }
  return { direction: u, maxDistance: Math.sqrt(Math.max(0, worst)) };
}
