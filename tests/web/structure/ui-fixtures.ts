/**
 * UI FIXTURE DATA — invented for the component tests of the batch and structure pages. These
 * are not results of the engine and not reference chemistry: the numbers only need the right
 * shapes and plausible sizes. (Reference geometries for the pure helpers are in the tests that
 * use them, each with its source.)
 */
import type * as z from 'zod';
import type { batchDetailSchema, StructureDetail, StructureRow } from '@shared/contracts/api';
import type { StructureResult } from '@shared/contracts/structure';
import { snapSettingsSchema } from '@shared/contracts/settings';

export type BatchDetail = z.infer<typeof batchDetailSchema>;

export const settings = snapSettingsSchema.parse({});

export function batchFixture(patch: Partial<BatchDetail> = {}): BatchDetail {
  return {
    id: 'b-1',
    workspaceSlug: 'demo',
    name: 'Fixture batch',
    status: 'done',
    submitter: { id: 'u-chem', name: 'Demo Chemist', email: 'chemist@example.org' },
    createdAt: '2026-03-01T10:00:00.000Z',
    finishedAt: '2026-03-01T10:02:00.000Z',
    counts: { total: 3, done: 3, clean: 2, overBudget: 1, knifeEdge: 0, error: 0, accepted: 1, flagged: 0 },
    groups: [
      { group: 'C2v', count: 2 },
      { group: 'C3v', count: 1 },
    ],
    signedOffBy: null,
    signedOffAt: null,
    settings,
    files: [{ name: 'fixture.xyz', sha256: 'f'.repeat(64), structures: 3 }],
    templates: [],
    ...patch,
  };
}

export function rowFixture(i: number, patch: Partial<StructureRow> = {}): StructureRow {
  return {
    id: `s-${i}`,
    batchId: 'b-1',
    name: `mol-${i}`,
    sourceFile: 'fixture.xyz',
    frameIndex: i - 1,
    status: 'done',
    error: null,
    formula: 'H2O',
    atomCount: 3,
    perceivedGroup: 'C2v',
    pointGroup: 'C2v',
    computationalSubgroup: 'C2v',
    symmetryRmsdBefore: 0.0012,
    symmetryRmsdAfter: 1e-12,
    displacementRmsd: 0.0004 * i,
    maxDisplacement: 0.0007 * i,
    csm: 0.0003,
    flags: [],
    review: 'pending',
    ...patch,
  };
}

/** Ammonia-shaped fixture (invented coordinates near a trigonal pyramid). */
export function resultFixture(patch: Partial<StructureResult> = {}): StructureResult {
  const atoms = [
    { element: 'N', x: 0, y: 0, z: 0.1163 },
    { element: 'H', x: 0, y: 0.9391, z: -0.2714 },
    { element: 'H', x: 0.8133, y: -0.4696, z: -0.2714 },
    { element: 'H', x: -0.8133, y: -0.4696, z: -0.2714 },
  ];
  return {
    name: 'mol-1',
    formula: 'H3N',
    pointGroup: 'C3v',
    perceivedGroup: 'C3v',
    order: 6,
    tolerance: 0.01,
    computationalSubgroup: 'Cs',
    computationalSubgroupAlternatives: [],
    rotationalSymmetryNumber: 3,
    symmetryRmsdBefore: 0.0021,
    symmetryRmsdAfter: 2e-12,
    displacementRmsd: 0.0011,
    maxDisplacement: 0.0019,
    csm: 0.0004,
    flags: [],
    flagNotes: [],
    charge: 0,
    multiplicity: 1,
    atoms,
    displacements: [0.0002, 0.0019, 0.0011, 0.0009],
    equivalenceClasses: [[0], [1, 2, 3]],
    uniqueAtoms: [0, 1],
    operations: [
      { symbol: 'E', kind: 'identity', order: 1, power: 1, axis: [0, 0, 0], matrix: [1, 0, 0, 0, 1, 0, 0, 0, 1], permutation: [0, 1, 2, 3], residual: 0 },
      { symbol: 'C3', kind: 'rotation', order: 3, power: 1, axis: [0, 0, 1], matrix: [-0.5, -0.866, 0, 0.866, -0.5, 0, 0, 0, 1], permutation: [0, 2, 3, 1], residual: 0.0031 },
      { symbol: 'σv', kind: 'reflection', order: 1, power: 1, axis: [1, 0, 0], matrix: [-1, 0, 0, 0, 1, 0, 0, 0, 1], permutation: [0, 1, 3, 2], residual: 0.0024 },
    ],
    elements: {
      axes: [{ order: 3, direction: [0, 0, 1], improperOrder: null, principal: true }],
      planes: [
        { normal: [1, 0, 0], kind: 'σv' },
        { normal: [0.5, 0.866, 0], kind: 'σv' },
        { normal: [0.5, -0.866, 0], kind: 'σv' },
      ],
      inversionCentre: false,
    },
    ladder: [
      { group: 'C1', order: 1, fromTolerance: 1e-4, toTolerance: 5e-4, displacementRmsd: 0, maxDisplacement: 0 },
      { group: 'Cs', order: 2, fromTolerance: 5e-4, toTolerance: 0.004, displacementRmsd: 0.0003, maxDisplacement: 0.0006 },
      { group: 'C3v', order: 6, fromTolerance: 0.004, toTolerance: 0.12, displacementRmsd: 0.0011, maxDisplacement: 0.0019 },
      { group: 'D3h', order: 12, fromTolerance: 0.12, toTolerance: 0.3, displacementRmsd: 0.21, maxDisplacement: 0.39 },
    ],
    frame: 'standard',
    transform: { rotation: [1, 0, 0, 0, 1, 0, 0, 0, 1], translation: [0, 0, 0] },
    engineVersion: 'fixture',
    ...patch,
  };
}

export function structureFixture(patch: Partial<StructureDetail> = {}): StructureDetail {
  const result = resultFixture();
  return {
    ...rowFixture(1, { formula: 'H3N', atomCount: 4, perceivedGroup: 'C3v', pointGroup: 'C3v', computationalSubgroup: 'Cs' }),
    charge: 0,
    multiplicity: 1,
    inputSha256: 'a'.repeat(64),
    inputAtoms: result.atoms.map((a, i) => ({ ...a, x: a.x + (i === 1 ? 0.0019 : 0) })),
    settings,
    result,
    reviews: [],
    ...patch,
  };
}

/** A JSON Response like the API's. */
export function json(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}
