import type { AtomJson } from '../contracts/structure';
import { atomicNumber, atomicWeight, normalizeElement } from '../elements';
import { EngineError } from './errors';
import { buildNeighbourGrid, forEachClosePair } from './neighbour-grid';
import { f64, i32 } from './arena';

/** Largest structure the engine accepts (atoms). Above it, EngineError 'too-many-atoms'. */
export const MAX_ATOMS = 200_000;
/** Largest accepted |coordinate| (Å). */
export const MAX_COORDINATE = 1e6;
/** Atoms closer than this (Å) are rejected as the same atom given twice. */
export const COINCIDENT_DISTANCE = 0.01;
/** Atoms closer than this (Å) raise the 'close-contact' flag. */
export const CLOSE_CONTACT_DISTANCE = 0.5;

/**
 * A validated structure, centred at its centre of mass (IUPAC 2021 standard atomic weights via
 * shared/elements). Immutable after construction; all engine stages read it.
 */
export interface PreparedMolecule {
  readonly n: number;
  /** Canonical element symbols, input order. */
  readonly symbols: readonly string[];
  /** Element ids (equal ids = same element); index into `kindSymbols`. */
  readonly kinds: Int32Array;
  readonly kindSymbols: readonly string[];
  readonly masses: Float64Array;
  readonly atomicNumbers: Int32Array;
  /** Centre of mass of the input (Å, input frame). */
  readonly centre: [number, number, number];
  /** Centred coordinates y = x − centre (x0,y0,z0,x1,…, Å). */
  readonly y: Float64Array;
  /** Largest |yᵢ| (Å). */
  readonly radius: number;
  /** Shortest interatomic distance below CLOSE_CONTACT_DISTANCE, or null. */
  readonly closeContact: { i: number; j: number; distance: number } | null;
}

/**
 * Validates atoms and centres them. Throws EngineError with a one-line message for: no atoms
 * ('empty'), more than MAX_ATOMS ('too-many-atoms'), an unknown element ('unknown-element'),
 * a non-finite or huge coordinate ('bad-coordinates'), two atoms within 0.01 Å
 * ('coincident-atoms'). Cost O(N) via a spatial hash.
 */
export function prepareMolecule(atoms: readonly AtomJson[]): PreparedMolecule {
  if (!Array.isArray(atoms) || atoms.length === 0) throw new EngineError('empty', 'the structure has no atoms');
  const n = atoms.length;
  if (n > MAX_ATOMS) {
    throw new EngineError('too-many-atoms', `the structure has ${n} atoms; the engine accepts at most ${MAX_ATOMS}`);
  }
  const symbols: string[] = new Array(n);
  const kinds = i32(n);
  const masses = f64(n);
  const numbers = i32(n);
  const kindIndex = new Map<string, number>();
  const kindSymbols: string[] = [];
  const kindMass: number[] = [];
  const kindNumber: number[] = [];
  const x = f64(3 * n);
  const known = new Map<string, string | null>();
  for (let i = 0; i < n; i++) {
    const a = atoms[i];
    let sym: string | null = null;
    if (a && typeof a.element === 'string') {
      sym = known.get(a.element) ?? null;
      if (sym === null) {
        sym = normalizeElement(a.element);
        known.set(a.element, sym);
      }
    }
    if (sym == null) {
      throw new EngineError('unknown-element', `atom ${i + 1}: unknown element '${String(a?.element ?? '')}'`);
    }
    symbols[i] = sym;
    let k = kindIndex.get(sym);
    if (k === undefined) {
      k = kindSymbols.length;
      kindIndex.set(sym, k);
      kindSymbols.push(sym);
      kindMass.push(atomicWeight(sym));
      kindNumber.push(atomicNumber(sym));
    }
    kinds[i] = k;
    masses[i] = kindMass[k];
    numbers[i] = kindNumber[k];
    x[3 * i] = checkedCoordinate(a.x, i, sym, 0);
    x[3 * i + 1] = checkedCoordinate(a.y, i, sym, 1);
    x[3 * i + 2] = checkedCoordinate(a.z, i, sym, 2);
  }
  let mt = 0;
  let cx = 0;
  let cy = 0;
  let cz = 0;
  for (let i = 0; i < n; i++) {
    const m = masses[i];
    mt += m;
    cx += m * x[3 * i];
    cy += m * x[3 * i + 1];
    cz += m * x[3 * i + 2];
  }
  const centre: [number, number, number] = [cx / mt, cy / mt, cz / mt];
  const y = f64(3 * n);
  let radius = 0;
  for (let i = 0; i < n; i++) {
    const p = x[3 * i] - centre[0];
    const q = x[3 * i + 1] - centre[1];
    const r = x[3 * i + 2] - centre[2];
    y[3 * i] = p;
    y[3 * i + 1] = q;
    y[3 * i + 2] = r;
    radius = Math.max(radius, Math.sqrt(p ** 2 + q ** 2 + r ** 2));
  }
  const closeContact = findCloseContact(y, kinds);
  return { n, symbols, kinds, kindSymbols, masses, atomicNumbers: numbers, centre, y, radius, closeContact };
}

/** A coordinate as given, checked: a finite number within ±MAX_COORDINATE. @throws EngineError('bad-coordinates'). */
function checkedCoordinate(v: unknown, i: number, sym: string, d: number): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || Math.abs(v) > MAX_COORDINATE) {
    throw new EngineError(
      'bad-coordinates',
      `atom ${i + 1} (${sym}): coordinate ${'xyz'[d]} = ${String(v)} is not a finite number within ±${MAX_COORDINATE} Å`,
    );
  }
  return v;
}

function findCloseContact(y: Float64Array, kinds: Int32Array): PreparedMolecule['closeContact'] {
  const n = kinds.length;
  if (n <= 150) return closeContactDirect(y, n);
  const grid = buildNeighbourGrid(y, kinds, CLOSE_CONTACT_DISTANCE);
  let best: PreparedMolecule['closeContact'] = null;
  let pairs = 0;
  // Real structures have at most a few close pairs per atom; a cap keeps junk input from
  // turning the O(N) scan quadratic.
  const cap = 20 * n + 1000;
  const coincident: { pair: [number, number, number] | null } = { pair: null };
  const finished = forEachClosePair(grid, CLOSE_CONTACT_DISTANCE, (i, j, d) => {
    if (d < COINCIDENT_DISTANCE) {
      coincident.pair = [i, j, d];
      return false;
    }
    if (!best || d < best.distance) best = { i, j, distance: d };
    return ++pairs <= cap;
  });
  if (coincident.pair) throw coincidentError(...coincident.pair);
  if (!finished) {
    throw new EngineError('bad-coordinates', `more than ${cap} atom pairs are closer than ${CLOSE_CONTACT_DISTANCE} Å: not a molecular structure`);
  }
  return best;
}

/** All pairs, for small structures (cheaper than building the grid). Same results and errors. */
function closeContactDirect(y: Float64Array, n: number): PreparedMolecule['closeContact'] {
  let best: PreparedMolecule['closeContact'] = null;
  const r2 = CLOSE_CONTACT_DISTANCE * CLOSE_CONTACT_DISTANCE;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const dx = y[3 * j] - y[3 * i];
      const dy = y[3 * j + 1] - y[3 * i + 1];
      const dz = y[3 * j + 2] - y[3 * i + 2];
      const d2 = dx * dx + dy * dy + dz * dz;
      if (d2 >= r2) continue;
      const d = Math.sqrt(d2);
      if (d < COINCIDENT_DISTANCE) throw coincidentError(i, j, d);
      if (!best || d < best.distance) best = { i, j, distance: d };
    }
  }
  return best;
}

function coincidentError(i: number, j: number, d: number): EngineError {
  return new EngineError(
    'coincident-atoms',
    `atoms ${i + 1} and ${j + 1} are ${d.toExponential(2)} Å apart (closer than ${COINCIDENT_DISTANCE} Å): the same atom given twice?`,
  );
}
