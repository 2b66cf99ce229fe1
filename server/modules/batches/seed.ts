import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { DataSource } from 'typeorm';
import type { SnapSettings } from '@shared/contracts/settings';
import { Batch } from './entity';
import { ingestUploads } from './ingest';
import { createBatchRepository } from './repository';
import { snapStructure, storable } from './snap-structure';

/** The demo batch's name: how the seed recognises that it already ran. */
export const DEMO_BATCH_NAME = 'Ligand and precursor screen (demo)';

/**
 * The demo batch's settings: a loose screening tolerance of 0.1 Å, so that the knife-edge and
 * over-budget cases of examples/demo show their flags (see examples/README.md).
 */
export const DEMO_SETTINGS: SnapSettings = {
  tolerance: 0.1,
  target: { kind: 'perceived' },
  frame: 'standard',
  displacementBudget: 0.05,
  charge: 0,
  multiplicity: null,
  outputFormats: ['xyz', 'qcschema', 'mol'],
};

const DEMO_DIR = new URL('../../../examples/demo/', import.meta.url);

/**
 * Seeds one finished batch made from examples/demo/ into the workspace, computed inline with the
 * engine (no queue: `npm start` seeds before the worker runs). Idempotent: a workspace that
 * already has the demo batch is left alone. No notice mail is sent for it.
 */
export async function seedDemoBatch(deps: { dataSource: DataSource; workspaceId: string; userId: string }): Promise<void> {
  const { dataSource, workspaceId, userId } = deps;
  const existing = await dataSource.getRepository(Batch).findOneBy({ workspaceId, name: DEMO_BATCH_NAME });
  if (existing) return;

  const dir = fileURLToPath(DEMO_DIR);
  const uploads = readdirSync(dir)
    .filter((f) => !f.startsWith('.'))
    .sort()
    .map((name) => ({ name, bytes: readFileSync(`${dir}${name}`) }));
  const { files, structures } = await ingestUploads(uploads, {
    maxStructures: 1000,
    maxAtoms: 20_000,
    zipMaxEntries: 100,
    zipMaxUncompressedBytes: 64 * 1024 * 1024,
    zipMaxRatio: 200,
  });

  const outcomes = structures.map((s) =>
    s.status === 'queued'
      ? snapStructure({
          molecule: { name: s.name, sourceFile: s.sourceFile, frameIndex: s.frameIndex, atoms: s.inputAtoms, charge: s.charge, multiplicity: s.multiplicity },
          settings: DEMO_SETTINGS,
        })
      : null,
  );

  const repo = createBatchRepository(dataSource);
  const batchId = await dataSource.transaction(async (m) => {
    // Re-check inside the transaction, under a lock on the workspace row, so two start-ups
    // racing each other seed once.
    await m.query(`SELECT id FROM workspaces WHERE id = $1 FOR UPDATE`, [workspaceId]);
    if (await m.getRepository(Batch).findOneBy({ workspaceId, name: DEMO_BATCH_NAME })) return null;
    const batch = await repo.insertBatch(m, {
      workspaceId,
      submitterId: userId,
      name: DEMO_BATCH_NAME,
      status: 'running',
      settings: DEMO_SETTINGS,
      files,
      total: structures.length,
    });
    await repo.insertStructures(m, batch, structures);
    return batch.id;
  });
  if (!batchId) return;

  for (const [i, s] of structures.entries()) {
    const out = outcomes[i];
    if (!out) continue;
    const timings = { queueMs: 0, engineMs: out.engineMs, writeMs: out.ok ? out.writeMs : 0, dbMs: 0 };
    if (out.ok) await repo.storeResult(s.id, 0, storable(out.result, out.outputs), timings);
    else await repo.storeFailure(s.id, 0, out.message, timings);
  }
  // Finished and already "announced": the demo batch sends no mail.
  await dataSource.query(`UPDATE batches SET notified_at = now(), started_at = created_at WHERE id = $1`, [batchId]);
  await repo.refreshBatch(batchId);
}
