/**
 * Element data for hydrogen (Z = 1) to oganesson (Z = 118): symbols, atomic numbers, standard
 * atomic weights and covalent radii.
 *
 * **Atomic weights.** IUPAC/CIAAW standard atomic weights 2021: Prohaska et al., "Standard atomic
 * weights of the elements 2021 (IUPAC Technical Report)", Pure Appl. Chem. 94, 573 (2022). Where
 * the standard weight is an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Br, Tl, and since 2021 Pb)
 * the IUPAC *conventional* value is used (H 1.008, C 12.011, …); otherwise the value as tabulated
 * (F 18.998403162, Co 58.933194, …). Elements with no standard atomic weight (Tc, Pm, Po–Ac,
 * Np–Og) carry the mass number of their longest-lived known isotope, as commonly tabulated,
 * and are marked `weightKind: 'mass-number'`.
 * **The numbers were typed from memory, not copied from the report**; the tests in
 * tests/shared/elements compare them with two registry packages (`node-periodic-table`,
 * `chemical-elements`) and with the values quoted in shared/reference/npm-data.md.
 * They are used for the centre of mass, where a 1e-4 relative error is irrelevant.
 *
 * **Covalent radii.** Cordero et al., "Covalent radii revisited", Dalton Trans. 2008, 2832
 * (doi 10.1039/b801115j), in Å, for H–Cm. Carbon is the sp3 value (0.76 Å; the paper also gives
 * sp2 0.73 and sp 0.69). Mn, Fe and Co are the low-spin values (1.39, 1.32, 1.26 Å; high spin
 * 1.61, 1.52, 1.50 Å). **These values are from memory** of the paper's table. The paper has no
 * values beyond curium: Bk–Og use a flat fallback of {@link FALLBACK_COVALENT_RADIUS} Å (common
 * practice with no source; marked `radiusKind: 'fallback'`). The radii are used only to draw
 * bonds in written molfiles.
 *
 * **Isotope labels.** `D` and `T` are *not* accepted as element symbols: mapping them to H would
 * silently change masses (and so the centre of mass and the standard frame) without the user
 * noticing. Readers report them as unknown elements with a hint to write `H`.
 */

/** One element's data row. */
export interface ElementData {
  /** IUPAC symbol, capitalised (`Cl`). */
  readonly symbol: string;
  /** Atomic number Z. */
  readonly z: number;
  /** Standard atomic weight (conventional value where an interval), or a mass number (see weightKind). */
  readonly weight: number;
  /** `standard`: IUPAC 2021 standard/conventional weight; `mass-number`: no standard weight exists. */
  readonly weightKind: 'standard' | 'mass-number';
  /** Covalent radius in Å. */
  readonly radius: number;
  /** `cordero`: Cordero et al. 2008; `fallback`: no published value used (Bk–Og). */
  readonly radiusKind: 'cordero' | 'fallback';
}

/** Covalent radius (Å) used for elements beyond curium, for which Cordero et al. give none. */
export const FALLBACK_COVALENT_RADIUS = 1.5;

// [symbol, weight, weight is a mass number?, Cordero radius or null]
// Weights: IUPAC 2021 (conventional where an interval), typed from memory. Radii: Cordero 2008, from memory.
type Row = readonly [string, number, boolean, number | null];
const ROWS: readonly Row[] = [
  ['H', 1.008, false, 0.31],
  ['He', 4.002602, false, 0.28],
  ['Li', 6.94, false, 1.28],
  ['Be', 9.0121831, false, 0.96],
  ['B', 10.81, false, 0.84],
  ['C', 12.011, false, 0.76],
  ['N', 14.007, false, 0.71],
  ['O', 15.999, false, 0.66],
  ['F', 18.998403162, false, 0.57],
  ['Ne', 20.1797, false, 0.58],
  ['Na', 22.98976928, false, 1.66],
  ['Mg', 24.305, false, 1.41],
  ['Al', 26.9815384, false, 1.21],
  ['Si', 28.085, false, 1.11],
  ['P', 30.973761998, false, 1.07],
  ['S', 32.06, false, 1.05],
  ['Cl', 35.45, false, 1.02],
  ['Ar', 39.95, false, 1.06],
  ['K', 39.0983, false, 2.03],
  ['Ca', 40.078, false, 1.76],
  ['Sc', 44.955907, false, 1.7],
  ['Ti', 47.867, false, 1.6],
  ['V', 50.9415, false, 1.53],
  ['Cr', 51.9961, false, 1.39],
  ['Mn', 54.938043, false, 1.39],
  ['Fe', 55.845, false, 1.32],
  ['Co', 58.933194, false, 1.26],
  ['Ni', 58.6934, false, 1.24],
  ['Cu', 63.546, false, 1.32],
  ['Zn', 65.38, false, 1.22],
  ['Ga', 69.723, false, 1.22],
  ['Ge', 72.63, false, 1.2],
  ['As', 74.921595, false, 1.19],
  ['Se', 78.971, false, 1.2],
  ['Br', 79.904, false, 1.2],
  ['Kr', 83.798, false, 1.16],
  ['Rb', 85.4678, false, 2.2],
  ['Sr', 87.62, false, 1.95],
  ['Y', 88.905838, false, 1.9],
  ['Zr', 91.224, false, 1.75],
  ['Nb', 92.90637, false, 1.64],
  ['Mo', 95.95, false, 1.54],
  ['Tc', 98, true, 1.47],
  ['Ru', 101.07, false, 1.46],
  ['Rh', 102.90549, false, 1.42],
  ['Pd', 106.42, false, 1.39],
  ['Ag', 107.8682, false, 1.45],
  ['Cd', 112.414, false, 1.44],
  ['In', 114.818, false, 1.42],
  ['Sn', 118.71, false, 1.39],
  ['Sb', 121.76, false, 1.39],
  ['Te', 127.6, false, 1.38],
  ['I', 126.90447, false, 1.39],
  ['Xe', 131.293, false, 1.4],
  ['Cs', 132.90545196, false, 2.44],
  ['Ba', 137.327, false, 2.15],
  ['La', 138.90547, false, 2.07],
  ['Ce', 140.116, false, 2.04],
  ['Pr', 140.90766, false, 2.03],
  ['Nd', 144.242, false, 2.01],
  ['Pm', 145, true, 1.99],
  ['Sm', 150.36, false, 1.98],
  ['Eu', 151.964, false, 1.98],
  ['Gd', 157.25, false, 1.96],
  ['Tb', 158.925354, false, 1.94],
  ['Dy', 162.5, false, 1.92],
  ['Ho', 164.930329, false, 1.92],
  ['Er', 167.259, false, 1.89],
  ['Tm', 168.934219, false, 1.9],
  ['Yb', 173.045, false, 1.87],
  ['Lu', 174.9668, false, 1.87],
  ['Hf', 178.486, false, 1.75],
  ['Ta', 180.94788, false, 1.7],
  ['W', 183.84, false, 1.62],
  ['Re', 186.207, false, 1.51],
  ['Os', 190.23, false, 1.44],
  ['Ir', 192.217, false, 1.41],
  ['Pt', 195.084, false, 1.36],
  ['Au', 196.96657, false, 1.36],
  ['Hg', 200.592, false, 1.32],
  ['Tl', 204.38, false, 1.45],
  ['Pb', 207.2, false, 1.46],
  ['Bi', 208.9804, false, 1.48],
  ['Po', 209, true, 1.4],
  ['At', 210, true, 1.5],
  ['Rn', 222, true, 1.5],
  ['Fr', 223, true, 2.6],
  ['Ra', 226, true, 2.21],
  ['Ac', 227, true, 2.15],
  ['Th', 232.0377, false, 2.06],
  ['Pa', 231.03588, false, 2.0],
  ['U', 238.02891, false, 1.96],
  ['Np', 237, true, 1.9],
  ['Pu', 244, true, 1.87],
  ['Am', 243, true, 1.8],
  ['Cm', 247, true, 1.69],
  ['Bk', 247, true, null],
  ['Cf', 251, true, null],
  ['Es', 252, true, null],
  ['Fm', 257, true, null],
  ['Md', 258, true, null],
  ['No', 259, true, null],
  ['Lr', 266, true, null],
  ['Rf', 267, true, null],
  ['Db', 268, true, null],
  ['Sg', 269, true, null],
  ['Bh', 270, true, null],
  ['Hs', 269, true, null],
  ['Mt', 278, true, null],
  ['Ds', 281, true, null],
  ['Rg', 282, true, null],
  ['Cn', 285, true, null],
  ['Nh', 286, true, null],
  ['Fl', 289, true, null],
  ['Mc', 290, true, null],
  ['Lv', 293, true, null],
  ['Ts', 294, true, null],
  ['Og', 294, true, null],
];

/** All 118 elements, index = Z − 1. See the module comment for sources. */
export const ELEMENTS: readonly ElementData[] = ROWS.map(([symbol, weight, isMassNumber, radius], i) => ({
  symbol,
  z: i + 1,
  weight,
  weightKind: isMassNumber ? 'mass-number' : 'standard',
  radius: radius ?? FALLBACK_COVALENT_RADIUS,
  radiusKind: radius == null ? 'fallback' : 'cordero',
}));

/** Element symbols H…Og, index = Z − 1. */
export const ELEMENT_SYMBOLS: readonly string[] = ELEMENTS.map((e) => e.symbol);

const BY_UPPER = new Map<string, ElementData>(ELEMENTS.map((e) => [e.symbol.toUpperCase(), e]));

/**
 * The canonical symbol for an element given as a symbol in any letter case (`'c'`, `'CL'`), an
 * atomic number (`6`), or an atomic number as text (`'6'`). Surrounding white space is ignored.
 * Returns null for anything else, including isotope labels `D`/`T` and dummy atoms (`X`).
 */
export function normalizeElement(raw: string | number): string | null {
  if (typeof raw === 'number') {
    return Number.isInteger(raw) && raw >= 1 && raw <= ELEMENTS.length ? ELEMENTS[raw - 1].symbol : null;
  }
  const t = raw.trim();
  if (/^\d{1,3}$/.test(t)) return normalizeElement(Number(t));
  return BY_UPPER.get(t.toUpperCase())?.symbol ?? null;
}

/**
 * The data row of an element (any form accepted by {@link normalizeElement}).
 * @throws RangeError with a one-line message if the element is unknown.
 */
export function elementData(symbol: string | number): ElementData {
  const s = normalizeElement(symbol);
  if (s == null) throw new RangeError(`unknown element '${String(symbol)}'`);
  return BY_UPPER.get(s.toUpperCase())!;
}

/** Atomic number Z. @throws RangeError if the element is unknown. */
export function atomicNumber(symbol: string): number {
  return elementData(symbol).z;
}

/**
 * IUPAC 2021 standard atomic weight (conventional value where the standard weight is an interval),
 * in daltons; for elements without one, the mass number of the longest-lived isotope.
 * @throws RangeError if the element is unknown.
 */
export function atomicWeight(symbol: string): number {
  return elementData(symbol).weight;
}

/**
 * Covalent radius in Å (Cordero et al. 2008; C sp3; Mn/Fe/Co low spin; Bk–Og fallback 1.5 Å).
 * @throws RangeError if the element is unknown.
 */
export function covalentRadius(symbol: string): number {
  return elementData(symbol).radius;
}
