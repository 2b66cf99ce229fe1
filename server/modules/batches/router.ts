import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { batchListQuerySchema, resnapRequestSchema, structureListQuerySchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { badRequest, DomainError } from '../../errors';
import { uploadRateLimit } from '../../middleware/rate-limit';
import { createBatchQueue, type BatchQueue } from '../../queue/batch-queue';
import { recordAudit } from '../audit/service';
import { createTemplateRepository } from '../templates/repository';
import { ANY_ROLE, workspaceAccess, WRITERS } from '../workspaces/access';
import { slugParams } from '../workspaces/params';
import { createBatchRepository } from './repository';
import { createBatchService, type CreateBatchInput } from './service';
import { writeBatchZip } from './zip-writer';

const MiB = 1024 * 1024;

/** `attachment` with an ASCII fallback and the UTF-8 name (RFC 6266 / RFC 5987). */
export function attachment(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]|["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

/** multer's limit errors as one-line domain errors (413 for sizes and counts, else 400). */
function uploadError(err: unknown, maxBytes: number, maxFiles: number): unknown {
  if (!(err instanceof multer.MulterError)) return err;
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new DomainError('too-large', `${err.field ? `'${err.field}': ` : ''}a file is larger than the upload limit of ${Math.round(maxBytes / MiB)} MiB`);
    case 'LIMIT_FILE_COUNT':
      return new DomainError('too-large', `More than ${maxFiles} files in one upload; put them in a ZIP archive or split the batch`);
    case 'LIMIT_UNEXPECTED_FILE':
      return badRequest(`Unexpected file field '${err.field}': send structure files in the field 'files'`);
    default:
      return badRequest(`The upload could not be read: ${err.message}`);
  }
}

/**
 * Batch and structure routes (mounted under /api). The queue producer is built on `deps.redis`
 * unless a test passes its own: a BullMQ Queue only issues plain commands, so it can share the
 * app's connection, and there is nothing extra to close.
 */
export function createBatchesRouter(deps: AppDeps & { queue?: BatchQueue }): Router {
  const { config, dataSource, logger } = deps;
  const queue = deps.queue ?? createBatchQueue({ connection: deps.redis, prefix: config.QUEUE_PREFIX });
  const repo = createBatchRepository(dataSource);
  const templateRepo = createTemplateRepository(dataSource);
  const service = createBatchService({ config, logger, repo, queue });
  const router = Router();

  const member = workspaceAccess(dataSource, ANY_ROLE);
  const writer = workspaceAccess(dataSource, WRITERS);
  const batchMember = workspaceAccess(dataSource, ANY_ROLE, (req) => repo.workspaceOfBatch(String(req.params.id)));
  const batchWriter = workspaceAccess(dataSource, WRITERS, (req) => repo.workspaceOfBatch(String(req.params.id)));
  const structureMember = workspaceAccess(dataSource, ANY_ROLE, (req) => repo.workspaceOfStructure(String(req.params.id)));

  const multipart = multer({
    storage: multer.memoryStorage(),
    defParamCharset: 'utf8',
    limits: {
      fileSize: config.UPLOAD_MAX_BYTES,
      files: config.UPLOAD_MAX_FILES,
      fields: 20,
      fieldSize: MiB,
      parts: config.UPLOAD_MAX_FILES + 20,
    },
  }).array('files', config.UPLOAD_MAX_FILES);

  const receiveFiles: RequestHandler = (req, res, next) => {
    const declared = Number(req.headers['content-length']);
    // Refuse before reading a body that is plainly too large (multipart framing adds a little).
    if (Number.isFinite(declared) && declared > config.UPLOAD_MAX_BYTES + MiB) {
      return next(new DomainError('too-large', `The upload is ${Math.round(declared / MiB)} MiB; the limit is ${Math.round(config.UPLOAD_MAX_BYTES / MiB)} MiB`));
    }
    multipart(req, res, (err: unknown) => {
      if (err) return next(uploadError(err, config.UPLOAD_MAX_BYTES, config.UPLOAD_MAX_FILES));
      const files = (req.files as Express.Multer.File[] | undefined) ?? [];
      const total = files.reduce((n, f) => n + f.size, 0);
      if (total > config.UPLOAD_MAX_BYTES) {
        return next(new DomainError('too-large', `The files add up to ${Math.round(total / MiB)} MiB; the limit is ${Math.round(config.UPLOAD_MAX_BYTES / MiB)} MiB`));
      }
      next();
    });
  };
  const uploads = (req: Express.Request) =>
    ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ name: f.originalname, bytes: f.buffer }));
  const limitUploads = uploadRateLimit(deps);

  router.get('/workspaces/:slug/batches', member, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await service.listBatches(req.access!, batchListQuerySchema.parse(req.query)));
  });

  router.post('/workspaces/:slug/batches', writer, limitUploads, receiveFiles, async (req, res) => {
    slugParams.parse(req.params);
    const body = (req.body ?? {}) as Record<string, unknown>;
    const input: CreateBatchInput = {
      name: typeof body.name === 'string' ? body.name : undefined,
      settings: typeof body.settings === 'string' ? body.settings : undefined,
      templateIds: body.templateIds,
    };
    const batch = await service.createBatch(req.access!, req.auth!.userId, input, uploads(req));
    res.status(201).location(`/api/batches/${batch.id}`).json(batch);
  });

  router.post('/workspaces/:slug/batches/preview', writer, limitUploads, receiveFiles, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await service.preview(req.access!, uploads(req)));
  });

  router.get('/batches/:id', batchMember, async (req, res) => {
    res.json(await service.getBatch(req.access!, String(req.params.id)));
  });

  router.post('/batches/:id/cancel', batchWriter, async (req, res) => {
    res.json(await service.cancelBatch(req.access!, req.auth!.userId, String(req.params.id)));
  });

  router.get('/batches/:id/structures', batchMember, async (req, res) => {
    res.json(await service.listStructures(req.access!, String(req.params.id), structureListQuerySchema.parse(req.query)));
  });

  router.get('/batches/:id/displacement-histogram', batchMember, async (req, res) => {
    res.json(await service.displacementHistogram(req.access!, String(req.params.id)));
  });

  router.post('/batches/:id/resnap', batchWriter, async (req, res) => {
    const body = resnapRequestSchema.parse(req.body ?? {});
    res.status(202).json(await service.resnap(req.access!, req.auth!.userId, String(req.params.id), body));
  });

  router.get('/batches/:id/download', batchMember, async (req, res) => {
    const access = req.access!;
    const batch = await service.scopedBatch(access, String(req.params.id));
    await recordAudit(dataSource, { workspaceId: access.workspace.id, actorId: req.auth!.userId, action: 'batch.downloaded', detail: { batchId: batch.id } });
    const stem = batch.name.replace(/\.[A-Za-z0-9]{1,8}$/, '').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'batch';
    res.setHeader('Content-Type', 'application/zip');
    res.setHeader('Content-Disposition', attachment(`${stem}-cleaned.zip`));
    res.setHeader('Cache-Control', 'no-store');
    try {
      await writeBatchZip(res, {
        batch,
        workspaceSlug: access.workspace.slug,
        page: (afterSeq, limit) => repo.structuresPage(batch.id, access.workspace.id, afterSeq, limit),
        templates: await templateRepo.batchCopies(batch.id),
        logger,
      });
    } catch (err) {
      // Headers are gone: cut the connection so the client sees a failed, not a short, download.
      logger.error({ err, batchId: batch.id }, 'batch download failed');
      res.destroy(err as Error);
    }
  });

  router.get('/structures/:id', structureMember, async (req, res) => {
    res.json(await service.getStructure(req.access!, String(req.params.id)));
  });

  router.get('/structures/:id/download', structureMember, async (req, res) => {
    const file = await service.structureFile(req.access!, req.auth!.userId, String(req.params.id), req.query.format);
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Disposition', attachment(file.fileName));
    res.send(file.text);
  });

  return router;
}
