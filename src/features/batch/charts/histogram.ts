/**
 * Bars for the batch's displacement histogram. The server counts (GET
 * /api/batches/:id/displacement-histogram) in the bins of `@shared/contracts/histogram`: a 1–2–5
 * log ladder from 1e-5 to 1 Å with one bin below the first edge and one at or above the last.
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

const short = (v: number) => (v >= 0.01 ? String(v) : v.toExponential(0).replace('e-', 'e−'));

/**
 * Labels the server's counts (`counts[0]` below `edges[0]`, the last at or above the last edge),
 * marks the bin holding the budget and trims empty bins at both ends, so a batch whose atoms all
 * moved ~10⁻³ Å shows a few bars, not seventeen.
 */
export function displacementHistogram({ edges, counts }: { edges: readonly number[]; counts: readonly number[] }, budget?: number): HistogramBin[] {
  if (counts.length !== edges.length + 1) throw new Error(`expected ${edges.length + 1} counts for ${edges.length} edges, got ${counts.length}`);
  const bins: HistogramBin[] = [];
  bins.push({ from: 0, to: edges[0], count: counts[0], label: `< ${short(edges[0])}`, holdsBudget: false });
  for (let i = 0; i < edges.length - 1; i++) {
    bins.push({ from: edges[i], to: edges[i + 1], count: counts[i + 1], label: `${short(edges[i])}–${short(edges[i + 1])}`, holdsBudget: false });
  }
  bins.push({ from: edges[edges.length - 1], to: Infinity, count: counts[edges.length], label: `≥ ${short(edges[edges.length - 1])}`, holdsBudget: false });
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
