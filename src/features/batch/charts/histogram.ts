/**
 * Bins for the batch's displacement histogram. Snapping moves atoms by anything from 10⁻⁶ to
 * 10⁻¹ Å, so the bins are logarithmic on a 1–2–5 ladder (1e-5, 2e-5, 5e-5, 1e-4 …, 1 Å), with
 * one bin below the first edge and one at or above the last.
 */

export interface HistogramBin {
  /** Lower edge, Å (0 for the underflow bin). */
  from: number;
  /** Upper edge, Å (Infinity for the overflow bin). */
  to: number;
  count: number;
  label: string;
  /** The displacement budget falls inside this bin. */
  holdsBudget: boolean;
}

/** Bin edges in Å: 1, 2, 5 × 10^k from 10^firstDecade up to and including 10^lastDecade. */
export function logEdges(firstDecade = -5, lastDecade = 0): number[] {
  const edges: number[] = [];
  for (let k = firstDecade; k < lastDecade; k++) for (const m of [1, 2, 5]) edges.push(Number((m * 10 ** k).toPrecision(1)));
  edges.push(10 ** lastDecade);
  return edges;
}

const short = (v: number) => (v >= 0.01 ? String(v) : v.toExponential(0).replace('e-', 'e−'));

/**
 * Counts values (Å; null and non-finite are skipped) into log bins and trims empty bins at both
 * ends, so a batch whose atoms all moved ~10⁻³ Å shows a few bars, not twenty.
 */
export function displacementHistogram(values: readonly (number | null)[], budget?: number, edges = logEdges()): HistogramBin[] {
  const bins: HistogramBin[] = [];
  bins.push({ from: 0, to: edges[0], count: 0, label: `< ${short(edges[0])}`, holdsBudget: false });
  for (let i = 0; i < edges.length - 1; i++) {
    bins.push({ from: edges[i], to: edges[i + 1], count: 0, label: `${short(edges[i])}–${short(edges[i + 1])}`, holdsBudget: false });
  }
  bins.push({ from: edges[edges.length - 1], to: Infinity, count: 0, label: `≥ ${short(edges[edges.length - 1])}`, holdsBudget: false });
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    const bin = bins.find((b) => v >= b.from && v < b.to) ?? bins[bins.length - 1];
    bin.count += 1;
  }
  if (budget !== undefined) {
    const b = bins.find((bin) => budget >= bin.from && budget < bin.to);
    if (b) b.holdsBudget = true;
  }
  const first = bins.findIndex((b) => b.count > 0 || b.holdsBudget);
  if (first < 0) return [];
  let last = bins.length - 1;
  while (last > first && bins[last].count === 0 && !bins[last].holdsBudget) last -= 1;
  return bins.slice(first, last + 1);
}
