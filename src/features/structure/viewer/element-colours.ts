import { atomicNumber, normalizeElement } from '@shared/elements';

/**
 * Pointfold's own element colours for the 3D view.
 *
 * Rationale: the colour of an atom is derived from where its element sits in the periodic table,
 * not from any viewer's convention, so that a user can reason about an unfamiliar colour:
 * - **Hue by column.** The eight main-group columns (1, 2, 13–18) are spread round the hue
 *   circle (40–65° apart, the widest gap between C and N), because most structures are made of
 *   main-group elements and neighbouring columns (C, N, O; the halogens) must be told apart at a
 *   glance. Transition metals (groups 3–12) share one muted steel band (hue 195°–285°, low
 *   saturation), lanthanides and actinides a muted bronze band: they are rarer and usually one or
 *   two per structure, so the legend names them.
 * - **Depth by period.** Period 1 is almost white with a tint of its column's hue, period 2
 *   pastel, period 3 deep and saturated, periods 4–7 darker and greyer; from period 3 on each
 *   period also turns the hue 15° further — the colour says "heavier" without a lookup, and
 *   O/S, F/Cl/Br differ in hue as well as depth.
 * - **Contrast.** Every colour is then lightened, if needed, until it has at least 3:1 contrast
 *   with the viewer's background (WCAG 2.1 SC 1.4.11, non-text contrast), computed with the WCAG
 *   relative-luminance formula. The test in tests/web/structure checks all 118 elements.
 *
 * Colour is never the only carrier: the viewer shows a legend with the element symbols, and
 * the atom table names every atom.
 */

/** Background of the 3D view ("night ink", a darker step of the palette's ink). */
export const VIEWER_BACKGROUND = '#141925';

/** Minimum contrast of an atom colour against {@link VIEWER_BACKGROUND} (WCAG 1.4.11). */
export const MIN_ATOM_CONTRAST = 3;

/** Where an element sits: period 1–7 and column 1–18, or `f` for the lanthanide/actinide rows. */
export interface TablePosition {
  period: number;
  /** 1–18; null inside the f-block. */
  group: number | null;
  /** 0–14 inside the f-block (La/Ac = 0), else null. */
  fIndex: number | null;
}

const PERIOD_ENDS = [2, 10, 18, 36, 54, 86, 118];

/** The periodic-table position of atomic number z (1–118), IUPAC 18-column layout with La–Lu and Ac–Lr in the f-block. */
export function tablePosition(z: number): TablePosition {
  if (!Number.isInteger(z) || z < 1 || z > 118) throw new RangeError(`no element with atomic number ${z}`);
  const period = PERIOD_ENDS.findIndex((end) => z <= end) + 1;
  const start = period === 1 ? 0 : PERIOD_ENDS[period - 2];
  const pos = z - start; // 1-based position within the period
  if (period === 1) return { period, group: pos === 1 ? 1 : 18, fIndex: null };
  if (period <= 3) return { period, group: pos <= 2 ? pos : pos + 10, fIndex: null };
  if (period <= 5) return { period, group: pos, fIndex: null };
  if (pos <= 2) return { period, group: pos, fIndex: null };
  if (pos <= 17) return { period, group: null, fIndex: pos - 3 };
  return { period, group: pos - 14, fIndex: null };
}

const MAIN_COLUMNS = [1, 2, 13, 14, 15, 16, 17, 18];

/** Hue of each main-group column (1, 2, 13–18), degrees: wider gaps where neighbours meet often (C, N, O). */
const MAIN_HUES = [15, 55, 95, 135, 200, 255, 300, 340];
/** Per period 1–7: lightness and saturation of main-group colours. */
const PERIOD_LIGHTNESS = [0.88, 0.7, 0.55, 0.45, 0.42, 0.42, 0.42];
const PERIOD_SATURATION = [0.45, 0.65, 0.8, 0.5, 0.35, 0.3, 0.3];
/** Hue turn (degrees) per period below period 2, so O/S/Se and F/Cl/Br differ in hue as well as depth. */
const HEAVY_HUE_TURN = 15;

/** Hue (degrees), saturation and lightness (0–1) before the contrast step. */
export function baseHsl(position: TablePosition): [number, number, number] {
  const { period, group, fIndex } = position;
  const lightness = PERIOD_LIGHTNESS[period - 1];
  if (fIndex !== null) return [28 + fIndex * 2.5, 0.28, lightness];
  const main = MAIN_COLUMNS.indexOf(group!);
  if (main >= 0) {
    const hue = (MAIN_HUES[main] + Math.max(0, period - 2) * HEAVY_HUE_TURN) % 360;
    return [hue, PERIOD_SATURATION[period - 1], lightness];
  }
  return [195 + (group! - 3) * 10, 0.22, lightness];
}

/** HSL (degrees, 0–1, 0–1) to `#rrggbb`. */
export function hslToHex(h: number, s: number, l: number): string {
  const k = (n: number) => (n + h / 30) % 12;
  const a = s * Math.min(l, 1 - l);
  const f = (n: number) => l - a * Math.max(-1, Math.min(k(n) - 3, Math.min(9 - k(n), 1)));
  return '#' + [f(0), f(8), f(4)].map((v) => Math.round(v * 255).toString(16).padStart(2, '0')).join('');
}

/** WCAG 2.1 relative luminance of `#rrggbb`. */
export function relativeLuminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.1 contrast ratio of two `#rrggbb` colours (1–21). */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

const cache = new Map<string, string>();

/** Fallback for a symbol that is not an element (dummy atoms): a neutral mid grey, still ≥ 3:1. */
export const UNKNOWN_ELEMENT_COLOUR = '#9a9a9a';

/** The colour of an element (symbol in any case) in the 3D view, `#rrggbb`. */
export function elementColour(symbol: string): string {
  const canonical = normalizeElement(symbol);
  if (!canonical) return UNKNOWN_ELEMENT_COLOUR;
  const hit = cache.get(canonical);
  if (hit) return hit;
  const [h, s, l0] = baseHsl(tablePosition(atomicNumber(canonical)));
  let l = l0;
  let hex = hslToHex(h, s, l);
  while (contrastRatio(hex, VIEWER_BACKGROUND) < MIN_ATOM_CONTRAST && l < 0.95) {
    l += 0.02;
    hex = hslToHex(h, s, l);
  }
  cache.set(canonical, hex);
  return hex;
}
