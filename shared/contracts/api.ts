import * as z from 'zod';
import { atomSchema, flagCodeSchema, structureResultSchema } from './structure';
import { snapSettingsSchema, targetPolicySchema } from './settings';
import { describeTemplateProblems, validateTemplate } from '../formats/template';

/**
 * JSON shapes of the REST API (see DEVELOPERS.md, "Routes"). The server parses requests and
 * serialises responses with these; the browser types its fetchers with them. Dates are ISO
 * strings. Lists are paginated on the server: `{ items, total, page, pageSize }`.
 */

export const roleSchema = z.enum(['owner', 'chemist', 'reviewer']);
export type Role = z.infer<typeof roleSchema>;

export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  database: z.boolean(),
  queue: z.boolean(),
  worker: z.boolean(),
});

export const userSchema = z.object({
  id: z.string(),
  login: z.string(),
  email: z.string(),
  name: z.string(),
});

export const workspaceSchema = z.object({
  id: z.string(),
  slug: z.string(),
  name: z.string(),
  defaults: snapSettingsSchema,
});

export const meSchema = z.object({
  user: userSchema,
  memberships: z.array(z.object({ workspace: workspaceSchema, role: roleSchema })),
});

export const paginationQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
});

export const page = <T extends z.ZodType>(item: T) =>
  z.object({ items: z.array(item), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });

export const batchStatusSchema = z.enum(['queued', 'running', 'done', 'failed', 'cancelled']);
export const structureStatusSchema = z.enum(['queued', 'running', 'done', 'error', 'cancelled']);
export const reviewStateSchema = z.enum(['pending', 'accepted', 'flagged']);

/** Counts of a batch's structures by outcome. `clean` = done with no flag. */
export const batchCountsSchema = z.object({
  total: z.number().int(),
  done: z.number().int(),
  clean: z.number().int(),
  overBudget: z.number().int(),
  knifeEdge: z.number().int(),
  error: z.number().int(),
  accepted: z.number().int(),
  flagged: z.number().int(),
});

export const batchSummarySchema = z.object({
  id: z.string(),
  workspaceSlug: z.string(),
  name: z.string(),
  status: batchStatusSchema,
  submitter: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  counts: batchCountsSchema,
  /** Perceived groups with how many structures have each, most common first. */
  groups: z.array(z.object({ group: z.string(), count: z.number().int() })),
  signedOffBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  signedOffAt: z.string().nullable(),
});
export type BatchSummary = z.infer<typeof batchSummarySchema>;

export const batchDetailSchema = batchSummarySchema.extend({
  settings: snapSettingsSchema,
  files: z.array(z.object({ name: z.string(), sha256: z.string(), structures: z.number().int() })),
  /** Export templates the batch renders per structure (its own copies, as they were at upload). */
  templates: z.array(z.object({ name: z.string(), fileExtension: z.string() })),
});

export const batchListQuerySchema = paginationQuerySchema.extend({
  status: batchStatusSchema.optional(),
  q: z.string().max(200).optional(),
});

/** One row of a batch's structure table (no coordinates). */
export const structureRowSchema = z.object({
  id: z.string(),
  batchId: z.string(),
  name: z.string(),
  sourceFile: z.string(),
  frameIndex: z.number().int(),
  status: structureStatusSchema,
  error: z.string().nullable(),
  formula: z.string().nullable(),
  atomCount: z.number().int(),
  perceivedGroup: z.string().nullable(),
  pointGroup: z.string().nullable(),
  computationalSubgroup: z.string().nullable(),
  symmetryRmsdBefore: z.number().nullable(),
  symmetryRmsdAfter: z.number().nullable(),
  displacementRmsd: z.number().nullable(),
  maxDisplacement: z.number().nullable(),
  csm: z.number().nullable(),
  flags: z.array(flagCodeSchema),
  review: reviewStateSchema,
});
export type StructureRow = z.infer<typeof structureRowSchema>;

export const structureListQuerySchema = paginationQuerySchema.extend({
  group: z.string().max(8).optional(),
  flag: flagCodeSchema.optional(),
  status: structureStatusSchema.optional(),
  review: reviewStateSchema.optional(),
  q: z.string().max(200).optional(),
  sort: z
    .enum(['name', 'formula', 'perceivedGroup', 'pointGroup', 'displacementRmsd', 'maxDisplacement', 'csm', 'symmetryRmsdBefore'])
    .default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});

/**
 * GET /api/batches/:id/displacement-histogram: the largest displacement per structure counted
 * over the whole batch, in the bins of `shared/contracts/histogram.ts` (a value on an edge counts
 * in the bin above it). `counts[0]` is the underflow bin (< edges[0]), the last is the overflow
 * bin (≥ the last edge); `counted` structures have a finite value, of `total` in the batch.
 */
export const displacementHistogramSchema = z
  .object({
    edges: z.array(z.number()).min(1),
    counts: z.array(z.number().int().nonnegative()),
    counted: z.number().int().nonnegative(),
    total: z.number().int().nonnegative(),
  })
  .refine((h) => h.counts.length === h.edges.length + 1, { message: 'counts needs one entry per bin (edges + 1)' });

export const reviewEventSchema = z.object({
  id: z.string(),
  structureId: z.string().nullable(),
  decision: z.enum(['accepted', 'flagged', 'signed-off']),
  comment: z.string(),
  reviewer: z.object({ id: z.string(), name: z.string() }),
  createdAt: z.string(),
});

export const structureDetailSchema = structureRowSchema.extend({
  charge: z.number().int(),
  multiplicity: z.number().int().nullable(),
  inputSha256: z.string(),
  inputAtoms: z.array(atomSchema),
  settings: snapSettingsSchema,
  result: structureResultSchema.nullable(),
  reviews: z.array(reviewEventSchema),
});
export type StructureDetail = z.infer<typeof structureDetailSchema>;

export const resnapRequestSchema = z.object({
  structureIds: z.array(z.string()).min(1).max(10_000),
  target: targetPolicySchema,
});

export const reviewRequestSchema = z.object({
  structureIds: z.array(z.string()).min(1).max(10_000),
  decision: z.enum(['accepted', 'flagged']),
  comment: z.string().max(4000).default(''),
});

export const memberSchema = z.object({ user: userSchema, role: roleSchema, joinedAt: z.string() });
export const invitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: roleSchema,
  expiresAt: z.string(),
  acceptedAt: z.string().nullable(),
});
export const apiTokenSchema = z.object({
  id: z.string(),
  label: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
  /** Whose token it is (owners list everyone's tokens of the workspace). */
  user: z.object({ id: z.string(), name: z.string(), login: z.string() }).optional(),
});
export const auditEntrySchema = z.object({
  id: z.string(),
  action: z.string(),
  actor: z.object({ id: z.string(), name: z.string() }).nullable(),
  detail: z.record(z.string(), z.unknown()),
  createdAt: z.string(),
});

const settingsShape = snapSettingsSchema.shape;
/**
 * Some snap settings, as given: unlike `snapSettingsSchema.partial()` (whose defaults fill every
 * missing key) an absent key stays absent, so a patch changes only what it names.
 */
export const snapSettingsPatchSchema = z
  .object({
    tolerance: settingsShape.tolerance.unwrap().optional(),
    target: settingsShape.target.unwrap().optional(),
    frame: settingsShape.frame.unwrap().optional(),
    displacementBudget: settingsShape.displacementBudget.unwrap().optional(),
    charge: settingsShape.charge.unwrap().optional(),
    multiplicity: settingsShape.multiplicity.unwrap().optional(),
    outputFormats: settingsShape.outputFormats.unwrap().optional(),
  })
  .strict();

/** PATCH /api/workspaces/:slug (owners): rename and/or change default snap settings (merged). */
export const workspaceUpdateSchema = z
  .object({
    name: z.string().trim().min(1).max(200).optional(),
    defaults: snapSettingsPatchSchema.optional(),
  })
  .strict();

/** PATCH /api/workspaces/:slug/members/:userId (owners). */
export const memberUpdateSchema = z.object({ role: roleSchema }).strict();

/** POST /api/workspaces/:slug/invitations (owners). The address is compared case-insensitively. */
export const invitationCreateSchema = z
  .object({ email: z.string().trim().toLowerCase().pipe(z.email().max(320)), role: roleSchema })
  .strict();

/** GET /api/invitations/:token — public: what the link is for, before signing in. */
export const invitationPeekSchema = z.object({
  workspace: z.object({ name: z.string(), slug: z.string() }),
  role: roleSchema,
  email: z.string(),
  invitedBy: z.string(),
  expiresAt: z.string(),
  status: z.enum(['pending', 'accepted', 'expired', 'revoked']),
});

/** POST /api/invitations/:token/accept — the workspace joined. */
export const invitationAcceptedSchema = z.object({
  workspace: z.object({ id: z.string(), slug: z.string(), name: z.string() }),
  role: roleSchema,
});

/** POST /api/workspaces/:slug/tokens. */
export const apiTokenCreateSchema = z.object({ label: z.string().trim().min(1).max(200) }).strict();
/** The created token; `token` is the secret, shown this once and never again. */
export const apiTokenCreatedSchema = apiTokenSchema.extend({ token: z.string() });

/** GET /api/workspaces/:slug/audit query. */
export const auditQuerySchema = paginationQuerySchema.extend({ action: z.string().max(64).optional() });

/** GET /api/workspaces/:slug/dev-mailbox: messages in the local fake inbox (development only). */
export const devMailMessageSchema = z.object({
  id: z.string(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  text: z.string(),
  date: z.string(),
});

/** Body of an error response: `{ error: { code, message } }`. */
export const apiErrorSchema = z.object({ error: z.object({ code: z.string(), message: z.string() }) });

/** A workspace's export template (GET /api/workspaces/:slug/templates). */
export const exportTemplateSchema = z.object({
  id: z.string(),
  name: z.string(),
  /** Without the dot: decks are written as `<structure>.<fileExtension>`. */
  fileExtension: z.string(),
  body: z.string(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type ExportTemplateDto = z.infer<typeof exportTemplateSchema>;

/** Largest template body accepted, characters (a deck is a page or two; this leaves room). */
export const TEMPLATE_BODY_MAX = 100_000;

const templateFields = {
  name: z.string().trim().min(1, 'name: required').max(100),
  /** A leading dot is dropped; letters, digits, `_` and `-`, and inner dots (`in.dat`). */
  fileExtension: z
    .string()
    .trim()
    .transform((e) => e.replace(/^\./, ''))
    .pipe(z.string().regex(/^[A-Za-z0-9_-]+(\.[A-Za-z0-9_-]+)*$/, 'fileExtension: letters, digits, _ and - (e.g. inp)').max(16)),
  body: z
    .string()
    .min(1, 'body: required')
    .max(TEMPLATE_BODY_MAX)
    .superRefine((body, ctx) => {
      const unknown = validateTemplate(body);
      if (unknown.length > 0) ctx.addIssue({ code: 'custom', message: `body: ${describeTemplateProblems(unknown)}` });
    }),
};

/** POST /api/workspaces/:slug/templates (owners). Unknown placeholders are a 400. */
export const exportTemplateCreateSchema = z.object(templateFields).strict();

/** PATCH /api/workspaces/:slug/templates/:id (owners): any of the fields. */
export const exportTemplateUpdateSchema = z
  .object({ name: templateFields.name.optional(), fileExtension: templateFields.fileExtension.optional(), body: templateFields.body.optional() })
  .strict();

/** Multipart field `templateIds` of a batch upload: JSON array of template ids (none by default). */
export const batchTemplateIdsSchema = z.array(z.string()).max(20, 'templateIds: at most 20 templates').default([]);
