import type { AtomJson } from '@shared/contracts/structure';

/**
 * Displacement arrows: snapping usually moves atoms by 10⁻⁴–10⁻² Å, invisible at molecular
 * scale, so each arrow (input position → output position) is drawn multiplied by one scale
 * factor for the whole structure, and the viewer states the factor.
 */

/** Length (Å on screen) the longest arrow is scaled to. */
export const TARGET_ARROW_LENGTH = 0.8;

/**
 * The scale factor that draws the longest displacement at about `target` Å, rounded down to a
 * 1–2–5 step (×1, ×2, ×5, ×10, ×20 …) so the label reads cleanly. Never below 1 (real
 * displacements are never shrunk) and 1 when nothing moved.
 */
export function arrowScale(maxDisplacement: number, target = TARGET_ARROW_LENGTH): number {
  if (!(maxDisplacement > 0) || !Number.isFinite(maxDisplacement)) return 1;
  const raw = target / maxDisplacement;
  if (raw <= 1) return 1;
  const decade = 10 ** Math.floor(Math.log10(raw));
  const mantissa = raw / decade;
  const step = mantissa >= 5 ? 5 : mantissa >= 2 ? 2 : 1;
  return step * decade;
}

/** One arrow: from the aligned input atom, pointing at the output atom, with its length multiplied by `scale`. */
export interface Arrow {
  atom: number;
  from: [number, number, number];
  to: [number, number, number];
  /** True displacement, Å. */
  length: number;
}

/**
 * Arrows from the input atoms (already brought into the output frame) to the output atoms,
 * drawn `scale` times longer than the true displacement. Atoms that moved less than
 * `minLength` Å get no arrow (nothing to see).
 */
export function displacementArrows(
  aligned: readonly AtomJson[],
  output: readonly AtomJson[],
  scale: number,
  minLength = 1e-6,
): Arrow[] {
  const arrows: Arrow[] = [];
  output.forEach((o, i) => {
    const a = aligned[i];
    if (!a) return;
    const d: [number, number, number] = [o.x - a.x, o.y - a.y, o.z - a.z];
    const length = Math.hypot(...d);
    if (length < minLength) return;
    arrows.push({ atom: i, from: [a.x, a.y, a.z], to: [a.x + d[0] * scale, a.y + d[1] * scale, a.z + d[2] * scale], length });
  });
  return arrows;
}
