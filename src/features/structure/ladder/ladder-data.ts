import type { LadderRungJson } from '@shared/contracts/structure';

/** A tolerance in Å, short but distinct for neighbouring rungs: `1e−4`, `2.5e−4`, `0.0043`, `0.3`. */
export function formatTolerance(value: number): string {
  if (!Number.isFinite(value)) return '∞';
  if (value < 1e-3) return Number(value.toPrecision(2)).toExponential().replace('e-', 'e−');
  return String(Number(value.toPrecision(3)));
}

/** The rung ranges for the chart, clipped to a positive tolerance so the log axis can draw them. */
export function ladderBars(ladder: readonly LadderRungJson[]) {
  return ladder.map((rung, i) => ({
    key: `r${i}`,
    group: rung.group,
    range: [Math.max(rung.fromTolerance, 1e-6), Math.max(rung.toTolerance, rung.fromTolerance * 1.0001, 1e-6)] as [number, number],
    cost: rung.displacementRmsd,
    max: rung.maxDisplacement,
  }));
}
