import { f64, i32 } from './arena';
/**
 * A uniform spatial hash for "nearest atom of the same element within r" queries: O(1) per query
 * for molecular densities, so testing one symmetry operation on N atoms costs O(N), never O(N²).
 * Cells are cubes of edge `cell` (Å). A nearest-atom query of radius r ≤ cell visits only the
 * cells overlapping the box [p − r, p + r] (at most 8 when r ≤ cell/2); the pair scan visits
 * the 27 cells around each atom. The table is open-addressed on typed arrays.
 */
export interface NeighbourGrid {
  readonly cell: number;
  readonly coords: Float64Array;
  readonly kinds: Int32Array;
  /** Hash slots: cell coordinates and the cell's range in `atoms`. */
  readonly slotX: Int32Array;
  readonly slotY: Int32Array;
  readonly slotZ: Int32Array;
  readonly slotStart: Int32Array;
  readonly slotEnd: Int32Array;
  readonly mask: number;
  /** Atom indices ordered by cell. */
  readonly atoms: Int32Array;
  /**
   * Small structures (≤ {@link SMALL_STRUCTURE} atoms): the atoms of each element sorted by x, and
   * their x coordinates; a query scans only the atoms whose x is within the radius (found by
   * binary search) — fewer steps than visiting cells. The hash is then left empty.
   */
  readonly byKind: readonly Int32Array[] | null;
  readonly xByKind: readonly Float64Array[] | null;
}

/** Structures up to this many atoms are searched by element lists instead of cells. */
export const SMALL_STRUCTURE = 96;

const EMPTY = -1;

function hash(ix: number, iy: number, iz: number, mask: number): number {
  return (Math.imul(ix, 73856093) ^ Math.imul(iy, 19349663) ^ Math.imul(iz, 83492791)) & mask;
}

/**
 * Builds the grid over centred coordinates `coords` (x0,y0,z0,…, Å) with element ids `kinds`.
 * `cell` must be positive; queries must use a radius ≤ `cell`.
 */
export function buildNeighbourGrid(coords: Float64Array, kinds: Int32Array, cell: number): NeighbourGrid {
  const n = kinds.length;
  if (n <= SMALL_STRUCTURE) return smallGrid(coords, kinds, cell);
  let size = 16;
  while (size < 2 * n) size *= 2;
  const mask = size - 1;
  const slotX = i32(size);
  const slotY = i32(size);
  const slotZ = i32(size);
  const slotCount = i32(size);
  const slotStart = i32(size).fill(EMPTY);
  const slotEnd = i32(size);
  const slotOf = i32(n);
  const inv = 1 / cell;
  for (let i = 0; i < n; i++) {
    const ix = Math.floor(coords[3 * i] * inv);
    const iy = Math.floor(coords[3 * i + 1] * inv);
    const iz = Math.floor(coords[3 * i + 2] * inv);
    let h = hash(ix, iy, iz, mask);
    while (slotStart[h] !== EMPTY && (slotX[h] !== ix || slotY[h] !== iy || slotZ[h] !== iz)) h = (h + 1) & mask;
    if (slotStart[h] === EMPTY) {
      slotStart[h] = 0;
      slotX[h] = ix;
      slotY[h] = iy;
      slotZ[h] = iz;
    }
    slotCount[h]++;
    slotOf[i] = h;
  }
  let offset = 0;
  for (let h = 0; h < size; h++) {
    if (slotStart[h] === EMPTY) continue;
    slotStart[h] = offset;
    slotEnd[h] = offset;
    offset += slotCount[h];
  }
  const atoms = i32(n);
  for (let i = 0; i < n; i++) atoms[slotEnd[slotOf[i]]++] = i;
  return { cell, coords, kinds, slotX, slotY, slotZ, slotStart, slotEnd, mask, atoms, byKind: null, xByKind: null };
}

const NO_ATOMS = new Int32Array(0);

function smallGrid(coords: Float64Array, kinds: Int32Array, cell: number): NeighbourGrid {
  const n = kinds.length;
  let kindCount = 0;
  for (let i = 0; i < n; i++) if (kinds[i] + 1 > kindCount) kindCount = kinds[i] + 1;
  const lists: number[][] = Array.from({ length: kindCount }, () => []);
  for (let i = 0; i < n; i++) lists[kinds[i]].push(i);
  const byKind = lists.map((l) => {
    // By x, then index: an insertion sort (at most SMALL_STRUCTURE atoms; the lists are in index
    // order already, so a strict comparison keeps equal x in index order).
    const out = i32(l.length);
    for (let k = 0; k < l.length; k++) {
      const v = l[k];
      const x = coords[3 * v];
      let p = k - 1;
      while (p >= 0 && coords[3 * out[p]] > x) {
        out[p + 1] = out[p];
        p--;
      }
      out[p + 1] = v;
    }
    return out;
  });
  const xByKind = byKind.map((l) => {
    const out = f64(l.length);
    for (let k = 0; k < l.length; k++) out[k] = coords[3 * l[k]];
    return out;
  });
  const none = NO_ATOMS;
  return {
    cell,
    coords,
    kinds,
    slotX: none,
    slotY: none,
    slotZ: none,
    slotStart: none,
    slotEnd: none,
    mask: 0,
    atoms: none,
    byKind,
    xByKind,
  };
}

/**
 * Index of the atom of element `kind` nearest to the point (q[0], q[1], q[2]) within radius q[3]
 * Å (≤ grid cell), or −1. The squared distance of the hit is left in `out[0]` when `out` is
 * given. The point comes in an array rather than as numbers: a call that is not inlined boxes
 * every computed number it passes (a heap allocation per coordinate per query, in the engine's
 * innermost loop — about 13 KB per structure of the bench).
 */
export function nearestOfKind(g: NeighbourGrid, q: Float64Array, kind: number, out?: Float64Array): number {
  if (g.byKind) return nearestInList(g, q, kind, out);
  const x = q[0];
  const y = q[1];
  const z = q[2];
  const radius = q[3];
  const inv = 1 / g.cell;
  const x0 = Math.floor((x - radius) * inv);
  const x1 = Math.floor((x + radius) * inv);
  const y0 = Math.floor((y - radius) * inv);
  const y1 = Math.floor((y + radius) * inv);
  const z0 = Math.floor((z - radius) * inv);
  const z1 = Math.floor((z + radius) * inv);
  let best = -1;
  let bestD2 = radius * radius;
  const { coords, kinds, atoms, slotStart, slotEnd, slotX, slotY, slotZ, mask } = g;
  for (let ix = x0; ix <= x1; ix++) {
    for (let iy = y0; iy <= y1; iy++) {
      for (let iz = z0; iz <= z1; iz++) {
        let h = hash(ix, iy, iz, mask);
        while (slotStart[h] !== EMPTY && (slotX[h] !== ix || slotY[h] !== iy || slotZ[h] !== iz)) h = (h + 1) & mask;
        if (slotStart[h] === EMPTY) continue;
        for (let k = slotStart[h], end = slotEnd[h]; k < end; k++) {
          const j = atoms[k];
          if (kinds[j] !== kind) continue;
          const ex = coords[3 * j] - x;
          const ey = coords[3 * j + 1] - y;
          const ez = coords[3 * j + 2] - z;
          const d2 = ex * ex + ey * ey + ez * ez;
          if (d2 <= bestD2) {
            // Ties go to the lower index so that matching is deterministic.
            if (d2 < bestD2 || best < 0 || j < best) best = j;
            bestD2 = d2;
          }
        }
      }
    }
  }
  if (out && best >= 0) out[0] = bestD2;
  return best;
}

function nearestInList(g: NeighbourGrid, q: Float64Array, kind: number, out?: Float64Array): number {
  if (kind >= g.byKind!.length) return -1;
  const x = q[0];
  const y = q[1];
  const z = q[2];
  const radius = q[3];
  const list = g.byKind![kind];
  const xs = g.xByKind![kind];
  const c = g.coords;
  // First atom with x ≥ x − radius.
  const from = x - radius;
  let lo = 0;
  let hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] < from) lo = mid + 1;
    else hi = mid;
  }
  const to = x + radius;
  let best = -1;
  let bestD2 = radius * radius;
  for (let k = lo; k < xs.length && xs[k] <= to; k++) {
    const j = list[k];
    const ex = c[3 * j] - x;
    const ey = c[3 * j + 1] - y;
    const ez = c[3 * j + 2] - z;
    const d2 = ex * ex + ey * ey + ez * ez;
    // Ties go to the lower index, as in the cell scan.
    if (d2 < bestD2 || (d2 === bestD2 && (best < 0 || j < best))) {
      best = j;
      bestD2 = d2;
    }
  }
  if (out && best >= 0) out[0] = bestD2;
  return best;
}

/**
 * Calls `visit(i, j, d)` for every pair of atoms (any elements) closer than `radius` ≤ cell, each
 * pair once (i < j). Stops early and returns false if `visit` returns false.
 */
export function forEachClosePair(
  g: NeighbourGrid,
  radius: number,
  visit: (i: number, j: number, d: number) => boolean,
): boolean {
  const { coords, atoms, slotStart, slotEnd, slotX, slotY, slotZ, mask } = g;
  const r2 = radius * radius;
  if (g.byKind) {
    const m = g.kinds.length;
    for (let i = 0; i < m; i++) {
      for (let j = i + 1; j < m; j++) {
        const ex = coords[3 * j] - coords[3 * i];
        const ey = coords[3 * j + 1] - coords[3 * i + 1];
        const ez = coords[3 * j + 2] - coords[3 * i + 2];
        const d2 = ex * ex + ey * ey + ez * ez;
        if (d2 < r2 && !visit(i, j, Math.sqrt(d2))) return false;
      }
    }
    return true;
  }
  const n = atoms.length;
  const inv = 1 / g.cell;
  for (let i = 0; i < n; i++) {
    const x = coords[3 * i];
    const y = coords[3 * i + 1];
    const z = coords[3 * i + 2];
    const cx = Math.floor(x * inv);
    const cy = Math.floor(y * inv);
    const cz = Math.floor(z * inv);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (let dz = -1; dz <= 1; dz++) {
          const ix = cx + dx;
          const iy = cy + dy;
          const iz = cz + dz;
          let h = hash(ix, iy, iz, mask);
          while (slotStart[h] !== EMPTY && (slotX[h] !== ix || slotY[h] !== iy || slotZ[h] !== iz)) h = (h + 1) & mask;
          if (slotStart[h] === EMPTY) continue;
          for (let k = slotStart[h], end = slotEnd[h]; k < end; k++) {
            const j = atoms[k];
            if (j <= i) continue;
            const ex = coords[3 * j] - x;
            const ey = coords[3 * j + 1] - y;
            const ez = coords[3 * j + 2] - z;
            const d2 = ex * ex + ey * ey + ez * ez;
            if (d2 < r2 && !visit(i, j, Math.sqrt(d2))) return false;
          }
        }
      }
    }
  }
  return true;
}
