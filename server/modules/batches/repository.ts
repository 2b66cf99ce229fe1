import type { DataSource, EntityManager } from 'typeorm';
import type { SnapSettings, TargetPolicy } from '@shared/contracts/settings';
import type { AtomJson, FlagCode } from '@shared/contracts/structure';
import { notFound } from '../../errors';
import { UUID_PATTERN } from '../workspaces/access';
import type { StorableResult } from './snap-structure';
import { Batch, Structure, type BatchStatus, type ReviewState, type StructureStatus, type StructureTimings } from './entity';

/*
 * All SQL of batches and structures. Every read that serves a caller takes the workspace id and
 * filters on it, so a wrong id can only ever come back empty (404), never as another group's data.
 * The worker's statements are conditional updates keyed on (id, revision, status): running one
 * twice changes nothing the second time, which is what makes re-delivered jobs harmless.
 */

type Db = DataSource | EntityManager;

/** A structure as the upload creates it. */
export interface NewStructure {
  id: string;
  seq: number;
  sourceFile: string;
  frameIndex: number;
  frameCount: number;
  name: string;
  inputAtoms: AtomJson[];
  atomCount: number;
  charge: number | null;
  multiplicity: number | null;
  inputSha256: string;
  status: Extract<StructureStatus, 'queued' | 'error'>;
  error: string | null;
}

/** What a snap job needs, read in the same statement that marks the structure running. */
export interface ClaimedStructure {
  batchId: string;
  name: string;
  sourceFile: string;
  frameIndex: number;
  inputAtoms: AtomJson[];
  charge: number | null;
  multiplicity: number | null;
  target: TargetPolicy | null;
  settings: SnapSettings;
  queueMs: number;
}

export interface StructureListFilter {
  group?: string;
  flag?: FlagCode;
  status?: StructureStatus;
  review?: ReviewState;
  q?: string;
  sort: string;
  dir: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

/** Columns of a structure-table row (no coordinates, no result JSON). */
export interface StructureRowRecord {
  id: string;
  batch_id: string;
  seq: number;
  name: string;
  source_file: string;
  frame_index: number;
  status: StructureStatus;
  error: string | null;
  formula: string | null;
  atom_count: number;
  perceived_group: string | null;
  point_group: string | null;
  computational_subgroup: string | null;
  symmetry_rmsd_before: number | null;
  symmetry_rmsd_after: number | null;
  displacement_rmsd: number | null;
  max_displacement: number | null;
  csm: number | null;
  flags: FlagCode[];
  review: ReviewState;
}

const ROW_COLUMNS = `s.id, s.batch_id, s.seq, s.name, s.source_file, s.frame_index, s.status, s.error, s.formula,
  s.atom_count, s.perceived_group, s.point_group, s.computational_subgroup, s.symmetry_rmsd_before,
  s.symmetry_rmsd_after, s.displacement_rmsd, s.max_displacement, s.csm, s.flags, s.review`;

const SORT_COLUMNS: Record<string, string> = {
  name: 's.name',
  formula: 's.formula',
  perceivedGroup: 's.perceived_group',
  pointGroup: 's.point_group',
  displacementRmsd: 's.displacement_rmsd',
  maxDisplacement: 's.max_displacement',
  csm: 's.csm',
  symmetryRmsdBefore: 's.symmetry_rmsd_before',
};

/** `UPDATE … RETURNING` through TypeORM yields [rows, count]; a SELECT yields rows. */
function rowsOf<T>(result: unknown): T[] {
  if (Array.isArray(result) && result.length === 2 && Array.isArray(result[0]) && typeof result[1] === 'number') {
    return result[0] as T[];
  }
  return result as T[];
}

const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

export function createBatchRepository(dataSource: DataSource) {
  return {
    dataSource,

    async insertBatch(db: Db, values: Pick<Batch, 'workspaceId' | 'submitterId' | 'name' | 'status' | 'settings' | 'files' | 'total'>): Promise<Batch> {
      const repo = db.getRepository(Batch);
      return repo.save(repo.create(values));
    },

    /**
     * Bulk insert: each chunk travels as one JSON parameter expanded by jsonb_to_recordset — one
     * round trip and no per-row ORM work, whatever the batch size.
     */
    async insertStructures(db: Db, batch: Pick<Batch, 'id' | 'workspaceId'>, structures: readonly NewStructure[]): Promise<void> {
      const chunk = 2000;
      for (let i = 0; i < structures.length; i += chunk) {
        await db.query(
          `INSERT INTO structures (id, batch_id, workspace_id, seq, source_file, frame_index, frame_count, name,
             input_atoms, atom_count, charge, multiplicity, input_sha256, status, error, revision)
           SELECT x.id, $2, $3, x.seq, x.source_file, x.frame_index, x.frame_count, x.name,
             x.input_atoms, x.atom_count, x.charge, x.multiplicity, x.input_sha256, x.status, x.error, 0
           FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, seq int, source_file text, frame_index int, frame_count int,
             name text, input_atoms jsonb, atom_count int, charge int, multiplicity int, input_sha256 text, status text, error text)`,
          [
            JSON.stringify(
              structures.slice(i, i + chunk).map((s) => ({
                id: s.id,
                seq: s.seq,
                source_file: s.sourceFile,
                frame_index: s.frameIndex,
                frame_count: s.frameCount,
                name: s.name,
                input_atoms: s.inputAtoms,
                atom_count: s.atomCount,
                charge: s.charge,
                multiplicity: s.multiplicity,
                input_sha256: s.inputSha256,
                status: s.status,
                error: s.error,
              })),
            ),
            batch.id,
            batch.workspaceId,
          ],
        );
      }
    },

    /** The workspace of a batch, for `workspaceAccess` (which then checks membership and role). */
    async workspaceOfBatch(id: string): Promise<{ id: string }> {
      const rows = UUID_PATTERN.test(id) ? await dataSource.query(`SELECT workspace_id FROM batches WHERE id = $1`, [id]) : [];
      if (!rows[0]) throw notFound('No such batch');
      return { id: rows[0].workspace_id };
    },

    async workspaceOfStructure(id: string): Promise<{ id: string }> {
      const rows = UUID_PATTERN.test(id) ? await dataSource.query(`SELECT workspace_id FROM structures WHERE id = $1`, [id]) : [];
      if (!rows[0]) throw notFound('No such structure');
      return { id: rows[0].workspace_id };
    },

    async findBatch(id: string): Promise<Batch | null> {
      return dataSource.getRepository(Batch).findOneBy({ id });
    },

    async findBatchInWorkspace(id: string, workspaceId: string): Promise<Batch | null> {
      return dataSource.getRepository(Batch).findOneBy({ id, workspaceId });
    },

    async listBatches(workspaceId: string, filter: { status?: BatchStatus; q?: string; page: number; pageSize: number }) {
      const qb = dataSource.getRepository(Batch).createQueryBuilder('b').where('b.workspace_id = :workspaceId', { workspaceId });
      if (filter.status) qb.andWhere('b.status = :status', { status: filter.status });
      if (filter.q) qb.andWhere(`b.name ILIKE :q ESCAPE '\\'`, { q: `%${escapeLike(filter.q)}%` });
      const [items, total] = await qb
        .orderBy('b.created_at', 'DESC')
        .addOrderBy('b.id', 'ASC')
        .skip((filter.page - 1) * filter.pageSize)
        .take(filter.pageSize)
        .getManyAndCount();
      return { items, total };
    },

    async listStructures(batchId: string, workspaceId: string, f: StructureListFilter): Promise<{ rows: StructureRowRecord[]; total: number }> {
      const where = ['s.batch_id = $1', 's.workspace_id = $2'];
      const params: unknown[] = [batchId, workspaceId];
      const add = (sql: string, value: unknown) => {
        params.push(value);
        where.push(sql.replaceAll('?', `$${params.length}`));
      };
      if (f.group) add('s.perceived_group = ?', f.group);
      if (f.flag) add('s.flags @> ARRAY[?]::text[]', f.flag);
      if (f.status) add('s.status = ?', f.status);
      if (f.review) add('s.review = ?', f.review);
      if (f.q) add(`(s.name ILIKE ? ESCAPE '\\' OR s.source_file ILIKE ? ESCAPE '\\' OR s.formula ILIKE ? ESCAPE '\\')`, `%${escapeLike(f.q)}%`);
      const sort = SORT_COLUMNS[f.sort] ?? 's.name';
      const dir = f.dir === 'desc' ? 'DESC' : 'ASC';
      const whereSql = where.join(' AND ');
      const [{ count }] = await dataSource.query(`SELECT count(*)::int AS count FROM structures s WHERE ${whereSql}`, params);
      const rows = await dataSource.query(
        `SELECT ${ROW_COLUMNS} FROM structures s WHERE ${whereSql}
         ORDER BY ${sort} ${dir} NULLS LAST, s.seq ASC LIMIT ${f.pageSize} OFFSET ${(f.page - 1) * f.pageSize}`,
        params,
      );
      return { rows, total: count };
    },

    /**
     * The batch's structures counted into displacement bins, in one statement: `width_bucket`
     * numbers the bins 0 (below the first edge) … edges.length (at or above the last), a value
     * on an edge going to the bin above it. Only finite values count (NULL for unfinished or
     * failed structures; NaN and ±Infinity are skipped too).
     */
    async displacementHistogram(batchId: string, workspaceId: string, edges: readonly number[]): Promise<{ counts: number[]; counted: number; total: number }> {
      const rows: { total: number; buckets: [number, number][] }[] = await dataSource.query(
        `WITH s AS (
           SELECT max_displacement AS v FROM structures WHERE batch_id = $1 AND workspace_id = $2
         ), b AS (
           SELECT width_bucket(v, $3::double precision[]) AS bucket, count(*)::int AS n FROM s
           WHERE v IS NOT NULL AND v NOT IN ('NaN'::double precision, 'Infinity'::double precision, '-Infinity'::double precision)
           GROUP BY 1
         )
         SELECT (SELECT count(*)::int FROM s) AS total,
                (SELECT coalesce(jsonb_agg(jsonb_build_array(bucket, n)), '[]'::jsonb) FROM b) AS buckets`,
        [batchId, workspaceId, edges],
      );
      const counts = new Array<number>(edges.length + 1).fill(0);
      for (const [bucket, n] of rows[0].buckets) counts[bucket] = n;
      return { counts, counted: counts.reduce((a, n) => a + n, 0), total: rows[0].total };
    },

    async findStructureInWorkspace(id: string, workspaceId: string): Promise<Structure | null> {
      return dataSource.getRepository(Structure).findOneBy({ id, workspaceId });
    },

    /** Structures of a batch in upload order, a page at a time (downloads stream through this). */
    async structuresPage(batchId: string, workspaceId: string, afterSeq: number, limit: number): Promise<Structure[]> {
      return dataSource
        .getRepository(Structure)
        .createQueryBuilder('s')
        .where('s.batch_id = :batchId AND s.workspace_id = :workspaceId AND s.seq > :afterSeq', { batchId, workspaceId, afterSeq })
        .orderBy('s.seq', 'ASC')
        .take(limit)
        .getMany();
    },

    async structuresByIds(batchId: string, workspaceId: string, ids: readonly string[]): Promise<Structure[]> {
      if (ids.length === 0) return [];
      return dataSource
        .getRepository(Structure)
        .createQueryBuilder('s')
        .where('s.batch_id = :batchId AND s.workspace_id = :workspaceId AND s.id IN (:...ids)', { batchId, workspaceId, ids })
        .getMany();
    },

    /** Names and e-mails of users (submitters, signers, reviewers). */
    async submitters(userIds: readonly string[]): Promise<Map<string, { id: string; name: string; email: string }>> {
      if (userIds.length === 0) return new Map();
      const rows: { id: string; name: string; email: string }[] = await dataSource.query(
        `SELECT id, name, email FROM users WHERE id = ANY($1::uuid[])`,
        [[...new Set(userIds)]],
      );
      return new Map(rows.map((r) => [r.id, r]));
    },

    // --- worker side -------------------------------------------------------------------------

    /**
     * Marks the structure running and returns its input, or null when there is nothing to do:
     * another revision is current, or the structure is already done, failed or cancelled.
     */
    async claimForSnap(structureId: string, revision: number): Promise<ClaimedStructure | null> {
      const rows = await dataSource.query(
        `WITH s AS (
           UPDATE structures SET status = 'running', started_at = now(), attempts = attempts + 1
           WHERE id = $1 AND revision = $2 AND status IN ('queued', 'running')
           RETURNING batch_id, name, source_file, frame_index, input_atoms, charge, multiplicity, target,
                     (extract(epoch FROM now() - queued_at) * 1000)::double precision AS queue_ms
         ), b AS (
           UPDATE batches SET status = 'running', started_at = coalesce(started_at, now())
           WHERE id = (SELECT batch_id FROM s) AND status = 'queued'
         )
         SELECT s.*, batches.settings FROM s JOIN batches ON batches.id = s.batch_id`,
        [structureId, revision],
      );
      const r = rows[0];
      if (!r) return null;
      return {
        batchId: r.batch_id,
        name: r.name,
        sourceFile: r.source_file,
        frameIndex: r.frame_index,
        inputAtoms: r.input_atoms,
        charge: r.charge,
        multiplicity: r.multiplicity,
        target: r.target,
        settings: r.settings,
        queueMs: r.queue_ms,
      };
    },

    /** The structure's batch and state, for a job that found nothing to claim. */
    async structureState(structureId: string): Promise<{ batchId: string; revision: number; status: StructureStatus } | null> {
      const rows = await dataSource.query(`SELECT batch_id, revision, status FROM structures WHERE id = $1`, [structureId]);
      return rows[0] ? { batchId: rows[0].batch_id, revision: rows[0].revision, status: rows[0].status } : null;
    },

    /** Stores a result; false when the structure moved on (re-snapped, cancelled) meanwhile. */
    async storeResult(structureId: string, revision: number, stored: StorableResult, timings: StructureTimings): Promise<boolean> {
      const c = stored.columns;
      const rows = rowsOf(
        await dataSource.query(
          `UPDATE structures SET status = 'done', error = NULL, formula = $3, perceived_group = $4, point_group = $5,
             group_order = $6, computational_subgroup = $7, symmetry_rmsd_before = $8, symmetry_rmsd_after = $9,
             displacement_rmsd = $10, max_displacement = $11, csm = $12, flags = $13::text[], result = $14::jsonb,
             outputs = $15::jsonb, engine_version = $16, timings = $17::jsonb, finished_at = now()
           WHERE id = $1 AND revision = $2 AND status IN ('queued', 'running')
           RETURNING id`,
          [
            structureId,
            revision,
            c.formula,
            c.perceivedGroup,
            c.pointGroup,
            c.order,
            c.computationalSubgroup,
            c.symmetryRmsdBefore,
            c.symmetryRmsdAfter,
            c.displacementRmsd,
            c.maxDisplacement,
            c.csm,
            c.flags,
            stored.resultJson,
            stored.outputsJson,
            c.engineVersion,
            JSON.stringify(timings),
          ],
        ),
      );
      return rows.length > 0;
    },

    /** Stores a failure (bad input, or retries exhausted); false when the structure moved on. */
    async storeFailure(structureId: string, revision: number, message: string, timings: StructureTimings | null): Promise<boolean> {
      const rows = rowsOf(
        await dataSource.query(
          `UPDATE structures SET status = 'error', error = $3, timings = $4::jsonb, finished_at = now()
           WHERE id = $1 AND revision = $2 AND status IN ('queued', 'running')
           RETURNING id`,
          [structureId, revision, message.slice(0, 2000), timings ? JSON.stringify(timings) : null],
        ),
      );
      return rows.length > 0;
    },

    /**
     * Recomputes a batch's counts and groups from its structures (COUNT-based: idempotent, so a
     * job delivered twice can't count twice), then finishes the batch when nothing is pending.
     * Returns the batch's status and whether its notice is still to be sent.
     */
    async refreshBatch(batchId: string): Promise<{ status: BatchStatus; needsNotice: boolean } | null> {
      // One statement (one round trip per result): counts, groups, and the finish when nothing is
      // pending. A batch with nothing snapped (every structure unreadable) has failed.
      const rows = await dataSource.query(
        `WITH c AS (
           SELECT count(*)::int AS total,
             count(*) FILTER (WHERE status IN ('queued', 'running'))::int AS pending,
             count(*) FILTER (WHERE status = 'done')::int AS done,
             count(*) FILTER (WHERE status = 'done' AND cardinality(flags) = 0)::int AS clean,
             count(*) FILTER (WHERE status = 'done' AND 'over-budget' = ANY(flags))::int AS over_budget,
             count(*) FILTER (WHERE status = 'done' AND 'knife-edge' = ANY(flags))::int AS knife_edge,
             count(*) FILTER (WHERE status = 'error')::int AS error,
             count(*) FILTER (WHERE review = 'accepted')::int AS accepted,
             count(*) FILTER (WHERE review = 'flagged')::int AS flagged
           FROM structures WHERE batch_id = $1
         ), g AS (
           SELECT coalesce(jsonb_agg(jsonb_build_object('group', grp, 'count', n) ORDER BY n DESC, grp), '[]'::jsonb) AS groups
           FROM (SELECT perceived_group AS grp, count(*)::int AS n FROM structures
                 WHERE batch_id = $1 AND status = 'done' AND perceived_group IS NOT NULL GROUP BY 1) x
         ), u AS (
           UPDATE batches b SET total = c.total, done_count = c.done, clean_count = c.clean,
             over_budget_count = c.over_budget, knife_edge_count = c.knife_edge, error_count = c.error,
             accepted_count = c.accepted, flagged_count = c.flagged, groups = g.groups,
             status = CASE WHEN b.status IN ('queued', 'running') AND c.pending = 0
                           THEN CASE WHEN c.done = 0 THEN 'failed' ELSE 'done' END ELSE b.status END,
             finished_at = CASE WHEN b.status IN ('queued', 'running') AND c.pending = 0 THEN now() ELSE b.finished_at END
           FROM c, g WHERE b.id = $1
           RETURNING b.status, b.notified_at
         )
         SELECT status, notified_at FROM u`,
        [batchId],
      );
      if (!rows[0]) return null;
      const status = rows[0].status as BatchStatus;
      return { status, needsNotice: (status === 'done' || status === 'failed') && rows[0].notified_at === null };
    },

    /** Claims the right to send a batch's notice (once); returns what the mail needs. */
    async batchForNotice(batchId: string) {
      const rows = await dataSource.query(
        `SELECT b.id, b.name, b.status, b.total, b.done_count, b.clean_count, b.over_budget_count, b.knife_edge_count,
                b.error_count, b.groups, b.notified_at, b.created_at, b.finished_at,
                u.email, u.name AS user_name, w.slug, w.name AS workspace_name
         FROM batches b JOIN users u ON u.id = b.submitter_id JOIN workspaces w ON w.id = b.workspace_id
         WHERE b.id = $1`,
        [batchId],
      );
      return rows[0] ?? null;
    },

    async markNotified(batchId: string): Promise<void> {
      await dataSource.query(`UPDATE batches SET notified_at = now() WHERE id = $1 AND notified_at IS NULL`, [batchId]);
    },

    /** Pending structures of live batches not touched for `staleMs` (their job may be lost). */
    async staleStructures(staleMs: number, limit: number): Promise<{ id: string; revision: number }[]> {
      return dataSource.query(
        `SELECT s.id, s.revision FROM structures s JOIN batches b ON b.id = s.batch_id
         WHERE s.status IN ('queued', 'running') AND b.status IN ('queued', 'running')
           AND coalesce(s.started_at, s.queued_at) < now() - ($1::double precision * interval '1 millisecond')
         ORDER BY coalesce(s.started_at, s.queued_at) ASC LIMIT $2`,
        [staleMs, limit],
      );
    },

    /** Batches to reconcile: live ones with nothing pending, and finished ones not yet announced. */
    async batchesToReconcile(): Promise<string[]> {
      const rows: { id: string }[] = await dataSource.query(
        `SELECT b.id FROM batches b
         WHERE (b.status IN ('queued', 'running')
                AND NOT EXISTS (SELECT 1 FROM structures s WHERE s.batch_id = b.id AND s.status IN ('queued', 'running')))
            OR (b.status IN ('done', 'failed') AND b.notified_at IS NULL AND b.finished_at > now() - interval '1 day')
         LIMIT 200`,
      );
      return rows.map((r) => r.id);
    },

    // --- cancel and re-snap -------------------------------------------------------------------

    /** Cancels a live batch and its pending structures; null when the batch was not live. */
    async cancelBatch(batchId: string, workspaceId: string): Promise<{ id: string; revision: number }[] | null> {
      return dataSource.transaction(async (m) => {
        const live = rowsOf(
          await m.query(
            `UPDATE batches SET status = 'cancelled', finished_at = now()
             WHERE id = $1 AND workspace_id = $2 AND status IN ('queued', 'running') RETURNING id`,
            [batchId, workspaceId],
          ),
        );
        if (live.length === 0) return null;
        return rowsOf<{ id: string; revision: number }>(
          await m.query(
            `UPDATE structures SET status = 'cancelled', finished_at = now()
             WHERE batch_id = $1 AND status IN ('queued', 'running') RETURNING id, revision`,
            [batchId],
          ),
        );
      });
    },

    /**
     * Puts structures back in the queue with a new target: a new revision each, so results of the
     * old one still in flight are dropped. A new result needs a new review decision. The batch
     * becomes running again (its notice is not re-sent).
     */
    async requeueStructures(batchId: string, workspaceId: string, ids: readonly string[], target: TargetPolicy): Promise<{ id: string; revision: number }[]> {
      return dataSource.transaction(async (m) => {
        const rows = rowsOf<{ id: string; revision: number }>(
          await m.query(
            `UPDATE structures SET status = 'queued', revision = revision + 1, target = $4::jsonb, error = NULL,
               queued_at = now(), started_at = NULL, finished_at = NULL, attempts = 0, review = 'pending'
             WHERE batch_id = $1 AND workspace_id = $2 AND id = ANY($3::uuid[]) RETURNING id, revision`,
            [batchId, workspaceId, ids, JSON.stringify(target)],
          ),
        );
        await m.query(`UPDATE batches SET status = 'running', finished_at = NULL WHERE id = $1`, [batchId]);
        return rows;
      });
    },
  };
}

export type BatchRepository = ReturnType<typeof createBatchRepository>;
