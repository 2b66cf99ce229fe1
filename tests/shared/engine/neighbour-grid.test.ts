/**
 * The neighbour search behind every operation match, in both of its modes (per-element lists
 * sorted by x for small structures, the cell hash for large ones), against the plain all-pairs
 * definition: the nearest atom of the element within the radius, ties to the lower index.
 * Points are random (mulberry32, tests/support/random.ts); no chemistry is involved.
 */
import { describe, expect, it } from 'vitest';
import { buildNeighbourGrid, forEachClosePair, nearestOfKind, SMALL_STRUCTURE } from '@shared/engine/neighbour-grid';
import { mulberry32 } from '../../support/random';

function cloud(n: number, seed: number, extent: number, kindCount: number) {
  const random = mulberry32(seed);
  const coords = new Float64Array(3 * n);
  const kinds = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    for (let d = 0; d < 3; d++) coords[3 * i + d] = (random() - 0.5) * extent;
    kinds[i] = Math.floor(random() * kindCount);
  }
  return { coords, kinds, random };
}

/** The definition: all atoms of the element, nearest within radius (inclusive), lowest index on ties. */
function bruteNearest(coords: Float64Array, kinds: Int32Array, p: number[], kind: number, radius: number): number {
  let best = -1;
  let bestD2 = radius * radius;
  for (let j = 0; j < kinds.length; j++) {
    if (kinds[j] !== kind) continue;
    const d2 = (coords[3 * j] - p[0]) ** 2 + (coords[3 * j + 1] - p[1]) ** 2 + (coords[3 * j + 2] - p[2]) ** 2;
    if (d2 < bestD2 || (d2 === bestD2 && best < 0)) {
      best = j;
      bestD2 = d2;
    }
  }
  return best;
}

describe.each([
  ['element lists (small structure)', 60],
  ['cell hash (large structure)', 600],
])('nearestOfKind with %s', (_, n) => {
  it(`uses the intended mode for ${n} atoms`, () => {
    const { coords, kinds } = cloud(n, 7, 12, 3);
    expect(buildNeighbourGrid(coords, kinds, 0.6).byKind !== null).toBe(n <= SMALL_STRUCTURE);
  });

  it('finds the same atom as the all-pairs definition, and reports its squared distance', () => {
    const { coords, kinds, random } = cloud(n, 11, n < 100 ? 5 : 12, 3);
    const radius = 0.9;
    const grid = buildNeighbourGrid(coords, kinds, 2 * radius);
    const out = new Float64Array(1);
    let hits = 0;
    for (let q = 0; q < 3000; q++) {
      // Queries near atoms (the usual case: the image of an atom under a near-symmetry) and anywhere.
      const i = Math.floor(random() * n);
      const p =
        q % 2 === 0
          ? [0, 1, 2].map((d) => coords[3 * i + d] + (random() - 0.5) * 1.2)
          : [0, 1, 2].map(() => (random() - 0.5) * (n < 100 ? 6 : 14));
      const kind = Math.floor(random() * 4); // kind 3 does not occur: never found
      const expected = bruteNearest(coords, kinds, p, kind, radius);
      const got = nearestOfKind(grid, Float64Array.of(p[0], p[1], p[2], radius), kind, out);
      expect(got).toBe(expected);
      if (got >= 0) {
        hits++;
        const d2 = (coords[3 * got] - p[0]) ** 2 + (coords[3 * got + 1] - p[1]) ** 2 + (coords[3 * got + 2] - p[2]) ** 2;
        expect(out[0]).toBe(d2);
      }
    }
    expect(hits).toBeGreaterThan(300);
  });

  it('breaks an exact tie towards the lower atom index', () => {
    const { coords, kinds } = cloud(n, 13, 40, 1);
    // Two atoms of kind 0 placed symmetrically about a query point, far from the rest.
    const [a, b] = [n - 1, 5];
    coords.set([30, 30, 30.25], 3 * a);
    coords.set([30, 30, 29.75], 3 * b);
    kinds[a] = 0;
    kinds[b] = 0;
    const grid = buildNeighbourGrid(coords, kinds, 0.6);
    expect(nearestOfKind(grid, Float64Array.of(30, 30, 30, 0.3), 0)).toBe(Math.min(a, b));
  });
});

describe.each([
  ['element lists (small structure)', 80],
  ['cell hash (large structure)', 700],
])('forEachClosePair with %s', (_, n) => {
  it('visits exactly the pairs closer than the radius, each once with i < j', () => {
    const { coords, kinds } = cloud(n, 17, n < 100 ? 5 : 11, 2);
    const radius = 1.0;
    const expected = new Set<string>();
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        const d = Math.hypot(coords[3 * i] - coords[3 * j], coords[3 * i + 1] - coords[3 * j + 1], coords[3 * i + 2] - coords[3 * j + 2]);
        if (d < radius) expected.add(`${i},${j}`);
      }
    }
    const seen = new Set<string>();
    forEachClosePair(buildNeighbourGrid(coords, kinds, radius), radius, (i, j, d) => {
      expect(i).toBeLessThan(j);
      expect(d).toBeCloseTo(Math.hypot(coords[3 * i] - coords[3 * j], coords[3 * i + 1] - coords[3 * j + 1], coords[3 * i + 2] - coords[3 * j + 2]), 12);
      seen.add(`${i},${j}`);
      return true;
    });
    expect(expected.size).toBeGreaterThan(10);
    expect([...seen].sort()).toEqual([...expected].sort());
  });
});
