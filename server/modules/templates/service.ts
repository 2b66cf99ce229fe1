import type { DataSource, EntityManager } from 'typeorm';
import type * as z from 'zod';
import { batchTemplateIdsSchema, type ExportTemplateDto, type exportTemplateCreateSchema, type exportTemplateUpdateSchema } from '@shared/contracts/api';
import { badRequest, DomainError, notFound } from '../../errors';
import { recordAudit } from '../audit/service';
import { UUID_PATTERN, type WorkspaceAccess } from '../workspaces/access';
import { ExportTemplate } from './entity';
import { createTemplateRepository, type TemplateRepository } from './repository';

export function toExportTemplateDto(t: ExportTemplate): ExportTemplateDto {
  return {
    id: t.id,
    name: t.name,
    fileExtension: t.fileExtension,
    body: t.body,
    createdAt: t.createdAt.toISOString(),
    updatedAt: t.updatedAt.toISOString(),
  };
}

/** PostgreSQL's unique_violation: two owners saving the same name at once. */
function isUniqueViolation(err: unknown): boolean {
  return typeof err === 'object' && err !== null && (err as { driverError?: { code?: string } }).driverError?.code === '23505';
}

const nameTaken = (name: string) => new DomainError('conflict', `A template named '${name}' already exists in this workspace`);

/**
 * Parses the upload's `templateIds` field: a JSON array of ids, or the field repeated. Absent or
 * empty means no templates. Throws bad-request for anything else.
 */
export function parseTemplateIdsField(field: unknown): string[] {
  let value: unknown = field ?? [];
  if (typeof field === 'string') {
    const text = field.trim();
    if (text === '') value = [];
    else if (/^[[{"]/.test(text)) {
      try {
        value = JSON.parse(text);
      } catch {
        throw badRequest('templateIds: not valid JSON');
      }
    } else value = [text];
  }
  const parsed = batchTemplateIdsSchema.safeParse(value);
  if (!parsed.success) throw badRequest(parsed.error.issues[0]?.message.startsWith('templateIds') ? parsed.error.issues[0].message : 'templateIds: expected a JSON array of template ids');
  return [...new Set(parsed.data)];
}

/**
 * The workspace's templates for these ids, in the order given. An id that is not one of this
 * workspace's templates is not-found (404), so another workspace's template stays invisible.
 */
export async function resolveBatchTemplates(repo: TemplateRepository, workspaceId: string, ids: readonly string[]): Promise<ExportTemplate[]> {
  if (!ids.every((id) => UUID_PATTERN.test(id))) throw notFound('No such export template in this workspace');
  const found = await repo.findManyInWorkspace(workspaceId, ids);
  const byId = new Map(found.map((t) => [t.id, t]));
  return ids.map((id) => {
    const t = byId.get(id);
    if (!t) throw notFound('No such export template in this workspace');
    return t;
  });
}

/** Export template use-cases: any member lists them, owners create, change and delete (audited). */
export function createTemplateService(deps: { dataSource: DataSource }) {
  const ds = deps.dataSource;
  const repo = createTemplateRepository(ds);

  async function scoped(db: DataSource | EntityManager, access: WorkspaceAccess, id: string): Promise<ExportTemplate> {
    const t = UUID_PATTERN.test(id) ? await repo.findInWorkspace(db, id, access.workspace.id) : null;
    if (!t) throw notFound('No such export template');
    return t;
  }

  return {
    async list(access: WorkspaceAccess): Promise<ExportTemplateDto[]> {
      return (await repo.list(access.workspace.id)).map(toExportTemplateDto);
    },

    async create(access: WorkspaceAccess, actorId: string, input: z.infer<typeof exportTemplateCreateSchema>): Promise<ExportTemplateDto> {
      try {
        return await ds.transaction(async (m) => {
          if (await repo.findByName(m, access.workspace.id, input.name)) throw nameTaken(input.name);
          const r = m.getRepository(ExportTemplate);
          const saved = await r.save(r.create({ workspaceId: access.workspace.id, ...input }));
          await recordAudit(m, {
            workspaceId: access.workspace.id,
            actorId,
            action: 'template.created',
            detail: { templateId: saved.id, name: saved.name, fileExtension: saved.fileExtension },
          });
          return toExportTemplateDto(saved);
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw nameTaken(input.name);
        throw err;
      }
    },

    async update(access: WorkspaceAccess, actorId: string, id: string, patch: z.infer<typeof exportTemplateUpdateSchema>): Promise<ExportTemplateDto> {
      try {
        return await ds.transaction(async (m) => {
          const t = await scoped(m, access, id);
          if (patch.name !== undefined && patch.name !== t.name && (await repo.findByName(m, access.workspace.id, patch.name))) throw nameTaken(patch.name);
          const changed = (Object.keys(patch) as (keyof typeof patch)[]).filter((k) => patch[k] !== undefined && patch[k] !== t[k]);
          Object.assign(t, Object.fromEntries(changed.map((k) => [k, patch[k]])));
          const saved = changed.length > 0 ? await m.getRepository(ExportTemplate).save(t) : t;
          if (changed.length > 0) {
            await recordAudit(m, { workspaceId: access.workspace.id, actorId, action: 'template.updated', detail: { templateId: t.id, name: t.name, changed } });
          }
          return toExportTemplateDto(saved);
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw nameTaken(patch.name ?? '');
        throw err;
      }
    },

    /** Deletes a template. Batches uploaded with it keep their own copy. */
    async remove(access: WorkspaceAccess, actorId: string, id: string): Promise<void> {
      await ds.transaction(async (m) => {
        const t = await scoped(m, access, id);
        await m.getRepository(ExportTemplate).delete({ id: t.id });
        await recordAudit(m, { workspaceId: access.workspace.id, actorId, action: 'template.deleted', detail: { templateId: t.id, name: t.name } });
      });
    },
  };
}
