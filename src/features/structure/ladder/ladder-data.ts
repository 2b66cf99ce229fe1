import type { LadderRungJson } from '@shared/contracts/structure';

/** A tolerance in Å, short: `1e−4`, `0.003`, `0.3`. */
export function formatTolerance(value: number): string {
  if (!Number.isFinite(value)) return '∞';
  if (value < 1e-3) return value.toExponential(0).replace('e-', 'e−');
  return String(Number(value.toPrecision(2)));
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
