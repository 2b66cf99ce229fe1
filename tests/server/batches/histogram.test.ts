import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { allRows, DEMO_FILES, get, member, upload, waitForBatch, type Member } from './support';

/*
 * GET /api/batches/:id/displacement-histogram counts the whole batch in SQL; here its counts are
 * checked against a plain JavaScript binning of the values the structure table returns, on a
 * batch snapped by the real worker and on values written straight into the database (edges).
 */

let db: TestDatabase;
let t: TestApp;
let processors: { close(): Promise<void> };
let chemist: Member;
let outsider: Member;
let batchId: string;

const ligands = DEMO_FILES.filter((f) => f.name === 'ligands.xyz');

/** The test's own binning: bin 0 below edges[0], bin i for edges[i-1] ≤ v < edges[i], last bin ≥ the last edge. */
function binInJs(values: readonly (number | null)[], edges: readonly number[]): number[] {
  const counts = new Array<number>(edges.length + 1).fill(0);
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    counts[edges.filter((e) => v >= e).length] += 1;
  }
  return counts;
}

const histogram = async (who: Member, id: string) => {
  const res = await get(t, who, `/api/batches/${id}/displacement-histogram`);
  expect(res.status).toBe(200);
  return res.body as { edges: number[]; counts: number[]; counted: number; total: number };
};

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  chemist = await member(db.dataSource, 'chemist');
  outsider = await member(db.dataSource, 'owner');
  processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
  const res = await upload(t, chemist, ligands, { settings: JSON.stringify({ tolerance: 0.1 }) });
  expect(res.status).toBe(201);
  batchId = res.body.id;
  await waitForBatch(t, chemist, batchId);
  // The outsider's own batch shares the table; it must never show up in the chemist's counts.
  expect((await upload(t, outsider, ligands)).status).toBe(201);
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
});

describe('displacement histogram', () => {
  it('has the 1–2–5 edges from 1e-5 to 1 Å and counts what the structure table shows', async () => {
    const h = await histogram(chemist, batchId);
    expect(h.edges).toEqual([1e-5, 2e-5, 5e-5, 1e-4, 2e-4, 5e-4, 1e-3, 2e-3, 5e-3, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1]);
    expect(h.counts).toHaveLength(17);
    const rows = await allRows(t, chemist, batchId);
    const values = rows.map((r) => r.maxDisplacement);
    expect(h.total).toBe(rows.length);
    expect(h.counted).toBe(values.filter((v) => v !== null).length);
    expect(h.counted).toBeGreaterThan(0);
    expect(h.counts).toEqual(binInJs(values, h.edges));
  });

  it('puts a value exactly on an edge in the bin above it, and skips NULL and NaN', async () => {
    const rows = await allRows(t, chemist, batchId);
    expect(rows.length).toBeGreaterThanOrEqual(10);
    // Written straight into the table: edges, just-below-edge values, the ends, no value and NaN.
    const set: [number | null | 'NaN', number][] = [
      [0, 0], // underflow
      [9.99e-6, 0], // underflow
      [1e-5, 1], // first edge → first interior bin
      [2e-4, 5], // edge 2e-4 (index 4) → bin 5
      [1.999e-4, 4],
      [0.05, 12], // edge index 11 → bin 12
      [0.99999, 16 - 1], // last interior bin [0.5, 1)
      [1, 16], // the last edge → overflow
      [null, -1],
      ['NaN', -1],
    ];
    for (const [i, [value]] of set.entries()) {
      await db.dataSource.query(`UPDATE structures SET max_displacement = $1::double precision WHERE id = $2`, [value, rows[i].id]);
    }
    const h = await histogram(chemist, batchId);
    const after = await allRows(t, chemist, batchId);
    const values = after.map((r) => r.maxDisplacement);
    expect(h.counts).toEqual(binInJs(values, h.edges));
    expect(h.total).toBe(after.length);
    // The values placed by hand (independent of either binning), plus the untouched rows.
    const expected = new Array<number>(17).fill(0);
    for (const [, bin] of set) if (bin >= 0) expected[bin] += 1;
    const untouched = after.filter((r) => !set.some((_s, i) => rows[i].id === r.id)).map((r) => r.maxDisplacement);
    const rest = binInJs(untouched, h.edges);
    // NULL and NaN (which the API returns as null) are not counted; every other written value is.
    expect(h.counted).toBe(8 + untouched.filter((v) => v !== null).length);
    expect(h.counts).toEqual(expected.map((n, i) => n + rest[i]));
    expect(h.counts[0]).toBeGreaterThanOrEqual(2);
    expect(h.counts[16]).toBeGreaterThanOrEqual(1);
  });

  it('answers 404 to an outsider and for an unknown batch, 401 without a caller', async () => {
    expect((await get(t, outsider, `/api/batches/${batchId}/displacement-histogram`)).status).toBe(404);
    expect((await get(t, chemist, `/api/batches/00000000-0000-4000-8000-000000000000/displacement-histogram`)).status).toBe(404);
    expect((await get(t, chemist, `/api/batches/not-a-uuid/displacement-histogram`)).status).toBe(404);
    expect((await request(t.app).get(`/api/batches/${batchId}/displacement-histogram`)).status).toBe(401);
  });
});
