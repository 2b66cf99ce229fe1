import { groupAt, type Analysis, type FoundGroup } from './analysis';

/** Lowest tolerance on the ladder (Å). */
export const LADDER_MIN = 1e-4;
/** Highest tolerance on the ladder (Å); candidates are searched at least this loosely (analysis.ts). */
export const LADDER_MAX = 0.3;
/** Number of log-spaced rungs sampled between them (the issue asks for at least 16). */
export const LADDER_RUNGS = 24;

/** The log-spaced tolerances 1e-4 … 0.3 Å (24 rungs, both ends included). */
export function ladderGrid(): readonly number[] {
  return GRID;
}

const GRID: readonly number[] = Object.freeze(
  Array.from({ length: LADDER_RUNGS }, (_, k) =>
    k === LADDER_RUNGS - 1 ? LADDER_MAX : Math.exp(Math.log(LADDER_MIN) + ((Math.log(LADDER_MAX) - Math.log(LADDER_MIN)) * k) / (LADDER_RUNGS - 1)),
  ),
);

/** One merged range of the ladder: `found` is the group for tolerances in [from, to). */
export interface LadderRange {
  readonly found: FoundGroup;
  readonly from: number;
  readonly to: number;
}

/**
 * The group at every rung of {@link ladderGrid}, merged into ranges of equal group name. Where
 * the group changes between two rungs, the exact change point is located: the group can only
 * change where the tolerance passes the residual of some operation (or the linearity or
 * inversion residual), so those values in between are tried in order. Ranges start at
 * LADDER_MIN and the last ends at LADDER_MAX.
 */
export function ladderRanges(a: Analysis): LadderRange[] {
  const grid = ladderGrid();
  const groups = grid.map((t) => groupAt(a, t));
  const ranges: LadderRange[] = [];
  let cur = { found: groups[0], from: LADDER_MIN };
  for (let k = 1; k < grid.length; k++) {
    if (groups[k].name === cur.found.name) continue;
    const lo = grid[k - 1];
    const hi = grid[k];
    const values = new Set<number>();
    for (const op of a.store.byKey.values()) if (op.residual > lo && op.residual < hi) values.add(op.residual);
    for (const v of [a.lineResidual, a.inversionResidual]) if (v > lo && v < hi) values.add(v);
    for (const v of [...values].sort((p, q) => p - q)) {
      const g = groupAt(a, v);
      if (g.name !== cur.found.name) {
        ranges.push({ found: cur.found, from: cur.from, to: v });
        cur = { found: g, from: v };
      }
    }
    if (cur.found.name !== groups[k].name) {
      ranges.push({ found: cur.found, from: cur.from, to: hi });
      cur = { found: groups[k], from: hi };
    }
  }
  ranges.push({ found: cur.found, from: cur.from, to: LADDER_MAX });
  // Two residuals equal up to rounding give an empty range: drop it, then re-merge neighbours.
  const merged: LadderRange[] = [];
  for (const r of ranges.filter((r, i) => i === ranges.length - 1 || r.to - r.from > 1e-12 * r.to)) {
    const last = merged[merged.length - 1];
    if (last && last.found.name === r.found.name) merged[merged.length - 1] = { ...last, to: r.to };
    else merged.push(r);
  }
  return merged;
}
