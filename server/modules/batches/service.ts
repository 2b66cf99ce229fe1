import { performance } from 'node:perf_hooks';
import type * as z from 'zod';
import type {
  batchDetailSchema,
  batchListQuerySchema,
  batchSummarySchema,
  displacementHistogramSchema,
  resnapRequestSchema,
  structureDetailSchema,
  structureListQuerySchema,
  structureRowSchema,
} from '@shared/contracts/api';
import { DISPLACEMENT_EDGES } from '@shared/contracts/histogram';
import { outputFormatSchema, snapSettingsSchema, type OutputFormat, type SnapSettings, type TargetPolicy } from '@shared/contracts/settings';
import type { StructureResult } from '@shared/contracts/structure';
import { allowedTargets, isKnownGroup, parseGroupName } from '@shared/engine';
import { OUTPUT_EXTENSIONS, outputFileName, verifyWritten, writeStructure } from '@shared/formats';
import type { Config } from '../../config';
import { badRequest, DomainError, notFound } from '../../errors';
import type { Logger } from '../../logger';
import type { BatchQueue } from '../../queue/batch-queue';
import { recordAudit } from '../audit/service';
import { createTemplateRepository } from '../templates/repository';
import { parseTemplateIdsField, resolveBatchTemplates } from '../templates/service';
import { ReviewEvent } from '../reviews/entity';
import { assertRole, UUID_PATTERN, WRITERS, type WorkspaceAccess } from '../workspaces/access';
import type { Batch, Structure } from './entity';
import { ingestUploads, type UploadedFile } from './ingest';
import type { BatchRepository, StructureRowRecord } from './repository';

type BatchSummary = z.infer<typeof batchSummarySchema>;
type BatchDetail = z.infer<typeof batchDetailSchema>;
type StructureRow = z.infer<typeof structureRowSchema>;
type StructureDetail = z.infer<typeof structureDetailSchema>;

export interface BatchServiceDeps {
  config: Config;
  logger: Logger;
  repo: BatchRepository;
  queue: BatchQueue;
}

/** What the upload form sends besides the files. */
export interface CreateBatchInput {
  name?: string;
  /** JSON text of a (partial) SnapSettings; workspace defaults fill the rest. */
  settings?: string;
  /** The multipart field `templateIds` as received: export templates to render per structure. */
  templateIds?: unknown;
}

const MIME: Record<OutputFormat, string> = {
  xyz: 'chemical/x-xyz',
  extxyz: 'chemical/x-xyz',
  mol: 'chemical/x-mdl-molfile',
  qcschema: 'application/json',
  unique: 'text/plain; charset=utf-8',
};

/** Complete snap settings: the form's values over the workspace's defaults, validated. */
export function resolveSettings(defaults: Partial<SnapSettings>, settingsJson: string | undefined): SnapSettings {
  let given: unknown = {};
  if (settingsJson && settingsJson.trim() !== '') {
    try {
      given = JSON.parse(settingsJson);
    } catch {
      throw badRequest('settings: not valid JSON');
    }
  }
  if (typeof given !== 'object' || given === null || Array.isArray(given)) throw badRequest('settings: expected a JSON object');
  const settings = snapSettingsSchema.parse({ ...defaults, ...given });
  return { ...settings, target: normalizeTarget(settings.target), outputFormats: [...new Set(settings.outputFormats)] };
}

/** Group names in Schoenflies plain text (`c2v` → `C2v`); unknown names are a 400. */
export function normalizeTarget(target: TargetPolicy): TargetPolicy {
  if (target.kind !== 'group') return target;
  const group = parseGroupName(target.group);
  if (!group || !isKnownGroup(group)) throw badRequest(`target: '${target.group}' is not a point group in Schoenflies notation (e.g. C2v, D3h, Td)`);
  return { kind: 'group', group };
}

export function toBatchSummary(b: Batch, slug: string, users: Map<string, { id: string; name: string; email: string }>): BatchSummary {
  const submitter = users.get(b.submitterId) ?? { id: b.submitterId, name: 'Former member', email: '' };
  const signer = b.signedOffById ? users.get(b.signedOffById) : undefined;
  return {
    id: b.id,
    workspaceSlug: slug,
    name: b.name,
    status: b.status,
    submitter,
    createdAt: b.createdAt.toISOString(),
    finishedAt: b.finishedAt?.toISOString() ?? null,
    counts: {
      total: b.total,
      done: b.doneCount,
      clean: b.cleanCount,
      overBudget: b.overBudgetCount,
      knifeEdge: b.knifeEdgeCount,
      error: b.errorCount,
      accepted: b.acceptedCount,
      flagged: b.flaggedCount,
    },
    groups: b.groups,
    signedOffBy: b.signedOffById ? { id: b.signedOffById, name: signer?.name ?? 'Former member' } : null,
    signedOffAt: b.signedOffAt?.toISOString() ?? null,
  };
}

export function toBatchDetail(
  b: Batch,
  slug: string,
  users: Map<string, { id: string; name: string; email: string }>,
  templates: readonly { name: string; fileExtension: string }[],
): BatchDetail {
  return {
    ...toBatchSummary(b, slug, users),
    settings: b.settings,
    files: b.files.map((f) => ({ name: f.name, sha256: f.sha256, structures: f.structures })),
    templates: templates.map((t) => ({ name: t.name, fileExtension: t.fileExtension })),
  };
}

export function toStructureRow(r: StructureRowRecord): StructureRow {
  return {
    id: r.id,
    batchId: r.batch_id,
    name: r.name,
    sourceFile: r.source_file,
    frameIndex: r.frame_index,
    status: r.status,
    error: r.error,
    formula: r.formula,
    atomCount: r.atom_count,
    perceivedGroup: r.perceived_group,
    pointGroup: r.point_group,
    computationalSubgroup: r.computational_subgroup,
    symmetryRmsdBefore: r.symmetry_rmsd_before,
    symmetryRmsdAfter: r.symmetry_rmsd_after,
    displacementRmsd: r.displacement_rmsd,
    maxDisplacement: r.max_displacement,
    csm: r.csm,
    flags: r.flags,
    review: r.review,
  };
}

/** The settings a structure is snapped with: the batch's, with its own re-snap target if any. */
export function effectiveSettings(batch: Pick<Batch, 'settings'>, s: Pick<Structure, 'target'>): SnapSettings {
  return s.target ? { ...batch.settings, target: s.target } : batch.settings;
}

/**
 * The batch use-cases: upload, read, cancel, re-snap, download one structure. Every read is
 * scoped to a workspace the caller belongs to (an id from elsewhere is a 404).
 */
export function createBatchService(deps: BatchServiceDeps) {
  const { repo, queue, config, logger } = deps;
  const ds = repo.dataSource;
  const templateRepo = createTemplateRepository(ds);

  /** The batch, read scoped to the caller's workspace; 404 for an unknown id or another workspace's batch. */
  async function scopedBatch(access: WorkspaceAccess, id: string): Promise<Batch> {
    const batch = UUID_PATTERN.test(id) ? await repo.findBatchInWorkspace(id, access.workspace.id) : null;
    if (!batch) throw notFound('No such batch');
    return batch;
  }

  async function scopedStructure(access: WorkspaceAccess, id: string): Promise<Structure> {
    const structure = UUID_PATTERN.test(id) ? await repo.findStructureInWorkspace(id, access.workspace.id) : null;
    if (!structure) throw notFound('No such structure');
    return structure;
  }

  async function detail(batch: Batch, slug: string): Promise<BatchDetail> {
    const users = await repo.submitters([batch.submitterId, ...(batch.signedOffById ? [batch.signedOffById] : [])]);
    return toBatchDetail(batch, slug, users, await templateRepo.batchCopies(batch.id));
  }

  const limits = {
    maxStructures: config.UPLOAD_MAX_STRUCTURES,
    maxAtoms: config.UPLOAD_MAX_ATOMS,
    zipMaxEntries: config.ZIP_MAX_ENTRIES,
    zipMaxUncompressedBytes: config.ZIP_MAX_UNCOMPRESSED_BYTES,
    zipMaxRatio: config.ZIP_MAX_RATIO,
  };

  return {
    scopedBatch,
    /**
     * Creates a batch from uploaded files: reads every structure (unreadable frames are stored as
     * errors), stores the batch and its structures in one transaction, then queues one snap job
     * per readable structure.
     */
    async createBatch(access: WorkspaceAccess, userId: string, input: CreateBatchInput, uploads: readonly UploadedFile[]): Promise<BatchDetail> {
      assertRole(access, WRITERS);
      const settings = resolveSettings(access.workspace.defaults ?? {}, input.settings);
      // Copied into the batch below, so later edits of a template never change this batch's decks.
      const templates = await resolveBatchTemplates(templateRepo, access.workspace.id, parseTemplateIdsField(input.templateIds));
      const t0 = performance.now();
      const { files, structures } = await ingestUploads(uploads, limits);
      const t1 = performance.now();
      const name = (input.name?.trim() || defaultBatchName(files.map((f) => f.name))).slice(0, 200);

      const batch = await ds.transaction(async (m) => {
        const b = await repo.insertBatch(m, {
          workspaceId: access.workspace.id,
          submitterId: userId,
          name,
          status: 'queued',
          settings,
          files,
          total: structures.length,
        });
        await repo.insertStructures(m, b, structures);
        await templateRepo.insertBatchCopies(m, b.id, templates);
        await recordAudit(m, {
          workspaceId: access.workspace.id,
          actorId: userId,
          action: 'batch.created',
          detail: { batchId: b.id, name, files: files.length, structures: structures.length, ...(templates.length > 0 ? { templates: templates.map((t) => t.name) } : {}) },
        });
        return b;
      });

      const t2 = performance.now();
      const jobs = structures.filter((s) => s.status === 'queued').map((s) => ({ structureId: s.id, revision: 0 }));
      try {
        await queue.enqueueSnaps(jobs);
        logger.info(
          { batchId: batch.id, structures: structures.length, parseMs: Math.round(t1 - t0), storeMs: Math.round(t2 - t1), queueMs: Math.round(performance.now() - t2) },
          'batch created',
        );
      } catch (err) {
        // The structures are stored; the worker's sweeper re-queues pending structures whose jobs
        // never arrived, so the batch still completes once Redis is back.
        logger.error({ err, batchId: batch.id }, 'could not queue the snap jobs; the sweeper will retry');
      }
      const state = await repo.refreshBatch(batch.id);
      if (state?.needsNotice) await queue.enqueueNotify(batch.id).catch(() => undefined);
      return detail((await repo.findBatch(batch.id))!, access.workspace.slug);
    },

    /** What the server recognises in the files, without storing anything. */
    async preview(access: WorkspaceAccess, uploads: readonly UploadedFile[]) {
      assertRole(access, WRITERS);
      const { files, structures } = await ingestUploads(uploads, limits);
      const formats: Record<string, number> = {};
      for (const f of files) if (f.format) formats[f.format] = (formats[f.format] ?? 0) + 1;
      const readable = structures.filter((s) => s.status === 'queued');
      return {
        files: files.map((f) => ({ name: f.name, format: f.format, frames: f.structures, structures: f.structures, bytes: f.bytes })),
        formats,
        frames: structures.length,
        structures: readable.length,
        atoms: readable.reduce((n, s) => n + s.atomCount, 0),
        errors: structures
          .filter((s) => s.status === 'error')
          .slice(0, 500)
          .map((s) => ({ file: s.sourceFile, frame: s.frameIndex, line: null, message: s.error ?? '' })),
      };
    },

    async listBatches(access: WorkspaceAccess, query: z.infer<typeof batchListQuerySchema>) {
      const { items, total } = await repo.listBatches(access.workspace.id, query);
      const users = await repo.submitters(items.flatMap((b) => [b.submitterId, ...(b.signedOffById ? [b.signedOffById] : [])]));
      return { items: items.map((b) => toBatchSummary(b, access.workspace.slug, users)), total, page: query.page, pageSize: query.pageSize };
    },

    async getBatch(access: WorkspaceAccess, id: string): Promise<BatchDetail> {
      return detail(await scopedBatch(access, id), access.workspace.slug);
    },

    /** Cancels a queued or running batch: pending structures are cancelled, waiting jobs dropped. */
    async cancelBatch(access: WorkspaceAccess, userId: string, id: string): Promise<BatchDetail> {
      assertRole(access, WRITERS);
      const batch = await scopedBatch(access, id);
      const cancelled = await repo.cancelBatch(batch.id, access.workspace.id);
      if (!cancelled) throw new DomainError('conflict', `The batch is already ${batch.status}; only a queued or running batch can be cancelled`);
      await repo.refreshBatch(batch.id);
      await recordAudit(ds, { workspaceId: access.workspace.id, actorId: userId, action: 'batch.cancelled', detail: { batchId: batch.id, structures: cancelled.length } });
      // Jobs still waiting would only be skipped by the worker; removing them frees the queue sooner.
      void queue.removeSnaps(cancelled.map((c) => ({ structureId: c.id, revision: c.revision }))).catch(() => undefined);
      return detail((await repo.findBatch(batch.id))!, access.workspace.slug);
    },

    async listStructures(access: WorkspaceAccess, batchId: string, query: z.infer<typeof structureListQuerySchema>) {
      const batch = await scopedBatch(access, batchId);
      const group = query.group ? (parseGroupName(query.group) ?? query.group) : undefined;
      const { rows, total } = await repo.listStructures(batch.id, access.workspace.id, { ...query, group });
      return { items: rows.map(toStructureRow), total, page: query.page, pageSize: query.pageSize };
    },

    /** The whole batch's largest displacements in the shared log bins (counted in SQL). */
    async displacementHistogram(access: WorkspaceAccess, batchId: string): Promise<z.infer<typeof displacementHistogramSchema>> {
      const batch = await scopedBatch(access, batchId);
      const { counts, counted, total } = await repo.displacementHistogram(batch.id, access.workspace.id, DISPLACEMENT_EDGES);
      return { edges: [...DISPLACEMENT_EDGES], counts, counted, total };
    },

    async getStructure(access: WorkspaceAccess, id: string): Promise<StructureDetail> {
      const s = await scopedStructure(access, id);
      const batch = (await repo.findBatchInWorkspace(s.batchId, access.workspace.id))!;
      const events = await ds.getRepository(ReviewEvent).find({ where: { structureId: s.id, workspaceId: access.workspace.id }, order: { createdAt: 'DESC' } });
      const reviewers = await repo.submitters(events.map((e) => e.reviewerId));
      return {
        id: s.id,
        batchId: s.batchId,
        name: s.name,
        sourceFile: s.sourceFile,
        frameIndex: s.frameIndex,
        status: s.status,
        error: s.error,
        formula: s.formula,
        atomCount: s.atomCount,
        perceivedGroup: s.perceivedGroup,
        pointGroup: s.pointGroup,
        computationalSubgroup: s.computationalSubgroup,
        symmetryRmsdBefore: s.symmetryRmsdBefore,
        symmetryRmsdAfter: s.symmetryRmsdAfter,
        displacementRmsd: s.displacementRmsd,
        maxDisplacement: s.maxDisplacement,
        csm: s.csm,
        flags: s.flags,
        review: s.review,
        charge: s.result?.charge ?? s.charge ?? batch.settings.charge,
        multiplicity: s.result?.multiplicity ?? s.multiplicity ?? batch.settings.multiplicity,
        inputSha256: s.inputSha256,
        inputAtoms: s.inputAtoms,
        settings: effectiveSettings(batch, s),
        result: s.status === 'done' ? s.result : null,
        reviews: events.map((e) => ({
          id: e.id,
          structureId: e.structureId,
          decision: e.decision,
          comment: e.comment,
          reviewer: { id: e.reviewerId, name: reviewers.get(e.reviewerId)?.name ?? 'Former member' },
          createdAt: e.createdAt.toISOString(),
        })),
      };
    },

    /**
     * Queues structures again with another target. A named group must be allowed for every
     * structure (a rung of its ladder or a subgroup of its perceived group): otherwise nothing is
     * queued and the 400 names the structure and what it allows.
     */
    async resnap(access: WorkspaceAccess, userId: string, batchId: string, body: z.infer<typeof resnapRequestSchema>) {
      assertRole(access, WRITERS);
      const batch = await scopedBatch(access, batchId);
      if (batch.status === 'cancelled') throw new DomainError('conflict', 'The batch was cancelled; upload it again to snap it');
      if (batch.signedOffAt) throw new DomainError('conflict', 'The batch is signed off; its results can no longer change');
      const target = normalizeTarget(body.target);
      const ids = [...new Set(body.structureIds)];
      if (!ids.every((id) => UUID_PATTERN.test(id))) throw notFound('No such structure in this batch');
      const structures = await repo.structuresByIds(batch.id, access.workspace.id, ids);
      if (structures.length !== ids.length) throw notFound('No such structure in this batch');
      for (const s of structures) {
        if (s.status !== 'done' || !s.result) {
          throw new DomainError('conflict', `${s.name}: only snapped structures can be re-snapped (this one is ${s.status})`);
        }
        if (target.kind === 'group') {
          const allowed = allowedTargets(s.result);
          if (!allowed.includes(target.group)) {
            throw badRequest(`${s.name}: ${target.group} is not an allowed target; choose one of ${allowed.join(', ')}`);
          }
        }
      }
      const requeued = await repo.requeueStructures(batch.id, access.workspace.id, ids, target);
      await recordAudit(ds, {
        workspaceId: access.workspace.id,
        actorId: userId,
        action: 'batch.resnapped',
        detail: { batchId: batch.id, structures: requeued.length, target },
      });
      await queue.enqueueSnaps(requeued.map((r) => ({ structureId: r.id, revision: r.revision })));
      await repo.refreshBatch(batch.id);
      return { queued: requeued.length, batch: await detail((await repo.findBatch(batch.id))!, access.workspace.slug) };
    },

    /** One cleaned file of one structure; formats not written by the worker are written (and checked) now. */
    async structureFile(access: WorkspaceAccess, userId: string, id: string, formatText: unknown) {
      const parsed = outputFormatSchema.safeParse(formatText ?? 'xyz');
      if (!parsed.success) throw badRequest(`format: expected one of ${Object.keys(OUTPUT_EXTENSIONS).join(', ')}`);
      const format = parsed.data;
      const s = await scopedStructure(access, id);
      if (s.status !== 'done' || !s.result) {
        throw new DomainError('conflict', `${s.name} has no cleaned file: it is ${s.status}${s.error ? ` (${s.error})` : ''}`);
      }
      const text = s.outputs?.[format] ?? writeChecked(format, s.result);
      await recordAudit(ds, { workspaceId: access.workspace.id, actorId: userId, action: 'structure.downloaded', detail: { structureId: s.id, format } });
      return { fileName: outputFileName(s.sourceFile, s.frameIndex, s.frameCount, format), contentType: MIME[format], text };
    },
  };
}

export type BatchService = ReturnType<typeof createBatchService>;

/** Writes a file and proves the written digits keep the group (throws EngineError otherwise). */
export function writeChecked(format: OutputFormat, result: StructureResult): string {
  const text = writeStructure(format, result);
  verifyWritten(format, text, result);
  return text;
}

function defaultBatchName(fileNames: readonly string[]): string {
  const tops = [...new Set(fileNames.map((n) => n.split('/')[0]))];
  if (tops.length === 0) return 'Untitled batch';
  return tops.length === 1 ? tops[0] : `${tops[0]} and ${tops.length - 1} more`;
}
