/**
 * Continuous symmetry measure in its size-normalised form (Zabrodsky, Peleg & Avnir, J. Am. Chem.
 * Soc. 114, 7843 (1992); normalisation of Pinsky & Avnir, Inorg. Chem. 37, 5575 (1998)):
 * S = 100 · Σ|Qᵢ − P̂ᵢ|² / Σ|Qᵢ − Q₀|², with Q the structure, P̂ the nearest symmetric structure
 * (here the group average in the fitted frame, for the perceived atom pairing — the pairing is
 * not re-optimised) and Q₀ the unweighted centroid of Q. Dimensionless, 0 exactly when
 * symmetric, at most 100. Both inputs in the same frame (Å).
 */
export function continuousSymmetryMeasure(q: ArrayLike<number>, symmetric: ArrayLike<number>): number {
  const n = q.length / 3;
  const c = [0, 0, 0];
  for (let i = 0; i < n; i++) for (let d = 0; d < 3; d++) c[d] += q[3 * i + d] / n;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    for (let d = 0; d < 3; d++) {
      num += (q[3 * i + d] - symmetric[3 * i + d]) ** 2;
      den += (q[3 * i + d] - c[d]) ** 2;
    }
  }
  return den > 0 ? Math.min(100, (100 * num) / den) : 0;
}
