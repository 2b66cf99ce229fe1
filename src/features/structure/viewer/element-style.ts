/**
 * How the symmetry elements are drawn over the molecule (Pointfold's own key).
 *
 * Axes are warm (saffron, the palette's highlight) and told apart by **line pattern** as well as
 * a text label at the end of each axis, so the order never depends on colour alone:
 * C2 solid · C3 long dashes · C4 short dashes · C5 dots · C6 dash-dot · C7 and up dash-dot-dot ·
 * C∞ solid and thick. The principal axis is drawn thicker. Planes are translucent discs in cool
 * tints (σh lapis, σv teal, σd violet); the centre of inversion is a small light octahedron.
 */

export const AXIS_COLOUR = '#f2b950';
export const PRINCIPAL_AXIS_COLOUR = '#ffcf73';
export const PLANE_COLOURS: Record<'σh' | 'σv' | 'σd' | 'σ', string> = {
  σh: '#8fb0ff',
  σv: '#6fd3bf',
  σd: '#c9a6f5',
  σ: '#b8c2d6',
};
export const INVERSION_COLOUR = '#f4f1ea';
export const PLANE_OPACITY = 0.2;

/** Dash pattern along an axis, in Å: alternating on/off lengths; empty = solid. */
export function axisPattern(order: number): number[] {
  switch (order) {
    case 2:
      return [];
    case 3:
      return [0.45, 0.2];
    case 4:
      return [0.2, 0.14];
    case 5:
      return [0.07, 0.12];
    case 6:
      return [0.4, 0.12, 0.07, 0.12];
    default:
      // 0 encodes C∞ in the contract; solid (and thicker, see axisThickness).
      return order <= 1 ? [] : [0.4, 0.1, 0.07, 0.1, 0.07, 0.1];
  }
}

/** Words for the pattern, shown in the key next to the toggles. */
export function axisPatternName(order: number): string {
  switch (order) {
    case 2:
      return 'solid';
    case 3:
      return 'long dashes';
    case 4:
      return 'short dashes';
    case 5:
      return 'dots';
    case 6:
      return 'dash-dot';
    case 0:
      return 'solid, thick';
    default:
      return 'dash-dot-dot';
  }
}

/** Cylinder radius (Å) for an axis. */
export function axisThickness(order: number, principal: boolean): number {
  const base = order === 0 ? 0.05 : 0.025 + 0.004 * Math.min(order, 8);
  return principal ? base * 1.5 : base;
}

/** Label of an axis: `C3`, `C∞`, and the coincident improper axis where there is one (`C4 · S8`). */
export function axisLabel(order: number, improperOrder: number | null): string {
  const c = order === 0 ? 'C∞' : `C${order}`;
  return improperOrder ? `${c} · S${improperOrder}` : c;
}

/**
 * Splits the segment from −half to +half (Å, along the axis) into the visible pieces of `pattern`,
 * symmetric about the centre so both ends of an axis look alike.
 * @returns [start, end] pairs in Å along the axis, start < end.
 */
export function dashSegments(half: number, pattern: readonly number[]): Array<[number, number]> {
  if (pattern.length === 0 || half <= 0) return half > 0 ? [[-half, half]] : [];
  const period = pattern.reduce((s, v) => s + v, 0);
  const out: Array<[number, number]> = [];
  // Walk outward from the centre on one side, mirror to the other.
  let t = 0;
  let k = 0;
  const side: Array<[number, number]> = [];
  while (t < half) {
    const len = pattern[k % pattern.length];
    if (k % 2 === 0) side.push([t, Math.min(half, t + len)]);
    t += len;
    k += 1;
    if (k > 10_000 || period <= 0) break;
  }
  for (const [a, b] of side) {
    if (a === 0) out.push([-b, b]);
    else out.push([a, b], [-b, -a]);
  }
  return out.sort((p, q) => p[0] - q[0]);
}
