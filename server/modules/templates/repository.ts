import { In, type DataSource, type EntityManager } from 'typeorm';
import { BatchExportTemplate, ExportTemplate } from './entity';

/** SQL of export templates: the workspace's own, and the copies kept with each batch. */
export function createTemplateRepository(dataSource: DataSource) {
  return {
    dataSource,

    list(workspaceId: string): Promise<ExportTemplate[]> {
      return dataSource.getRepository(ExportTemplate).find({ where: { workspaceId }, order: { name: 'ASC' } });
    },

    findInWorkspace(db: DataSource | EntityManager, id: string, workspaceId: string): Promise<ExportTemplate | null> {
      return db.getRepository(ExportTemplate).findOneBy({ id, workspaceId });
    },

    findByName(db: DataSource | EntityManager, workspaceId: string, name: string): Promise<ExportTemplate | null> {
      return db.getRepository(ExportTemplate).findOneBy({ workspaceId, name });
    },

    /** The workspace's templates with these ids (any order; missing ids are simply absent). */
    findManyInWorkspace(workspaceId: string, ids: readonly string[]): Promise<ExportTemplate[]> {
      if (ids.length === 0) return Promise.resolve([]);
      return dataSource.getRepository(ExportTemplate).findBy({ workspaceId, id: In([...ids]) });
    },

    /** Stores a batch's copies of its templates, in the order given (inside the batch's transaction). */
    async insertBatchCopies(m: EntityManager, batchId: string, templates: readonly ExportTemplate[]): Promise<void> {
      if (templates.length === 0) return;
      await m.getRepository(BatchExportTemplate).insert(
        templates.map((t, position) => ({ batchId, position, templateId: t.id, name: t.name, fileExtension: t.fileExtension, body: t.body })),
      );
    },

    /** The template copies a batch was uploaded with, in the chosen order. */
    batchCopies(batchId: string): Promise<BatchExportTemplate[]> {
      return dataSource.getRepository(BatchExportTemplate).find({ where: { batchId }, order: { position: 'ASC' } });
    },
  };
}

export type TemplateRepository = ReturnType<typeof createTemplateRepository>;
