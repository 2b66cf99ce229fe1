/**
 * Bin edges of the batch's displacement histogram, shared by the server (which counts) and the
 * web app (which labels), so the two agree by construction. Snapping moves atoms by anything from
 * 10⁻⁶ to 10⁻¹ Å, so the bins are logarithmic on a 1–2–5 ladder (1e-5, 2e-5, 5e-5, 1e-4 …, 1 Å),
 * with one underflow bin below the first edge and one overflow bin at or above the last.
 *
 * Rule: a value exactly on an edge belongs to the bin that edge opens (the upper one), i.e. bin i
 * holds edges[i-1] ≤ v < edges[i]; bin 0 is v < edges[0]; bin edges.length is v ≥ the last edge.
 * PostgreSQL's `width_bucket(v, edges)` numbers the bins the same way.
 */

/** Bin edges in Å: 1, 2, 5 × 10^k from 10^firstDecade up to and including 10^lastDecade. */
export function logEdges(firstDecade = -5, lastDecade = 0): number[] {
  const edges: number[] = [];
  for (let k = firstDecade; k < lastDecade; k++) for (const m of [1, 2, 5]) edges.push(Number((m * 10 ** k).toPrecision(1)));
  edges.push(10 ** lastDecade);
  return edges;
}

/** The edges every displacement histogram uses: 1e-5 … 1 Å (16 edges, so 17 bins). */
export const DISPLACEMENT_EDGES: readonly number[] = Object.freeze(logEdges(-5, 0));
