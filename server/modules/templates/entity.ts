import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique, UpdateDateColumn } from 'typeorm';
import { Batch } from '../batches/entity';
import { Workspace } from '../workspaces/entity';

/**
 * A workspace's export template: an input deck with Pointfold placeholders (shared/formats/template.ts),
 * rendered once per structure into the batch ZIP as `<structure>.<fileExtension>`. Owners keep them.
 */
@Entity({ name: 'export_templates' })
@Unique('uq_export_templates_workspace_name', ['workspaceId', 'name'])
export class ExportTemplate {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'uuid', name: 'workspace_id' })
  workspaceId!: string;

  @ManyToOne(() => Workspace, { onDelete: 'CASCADE', createForeignKeyConstraints: true })
  @JoinColumn({ name: 'workspace_id' })
  workspace?: Workspace;

  @Column({ type: 'varchar', length: 100 })
  name!: string;

  /** Without the dot, e.g. `inp`. */
  @Column({ type: 'varchar', length: 16, name: 'file_extension' })
  fileExtension!: string;

  @Column({ type: 'text' })
  body!: string;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'timestamptz', name: 'updated_at' })
  updatedAt!: Date;
}

/**
 * The copy of a template a batch was uploaded with. Copied, not referenced, so editing or deleting
 * the workspace's template later never changes what a finished batch's ZIP holds (provenance).
 */
@Entity({ name: 'batch_export_templates' })
@Unique('uq_batch_export_templates_position', ['batchId', 'position'])
export class BatchExportTemplate {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Index()
  @Column({ type: 'uuid', name: 'batch_id' })
  batchId!: string;

  @ManyToOne(() => Batch, { onDelete: 'CASCADE', createForeignKeyConstraints: true })
  @JoinColumn({ name: 'batch_id' })
  batch?: Batch;

  /** Order chosen in the form (0-based): decks are written in this order. */
  @Column({ type: 'integer' })
  position!: number;

  /** The workspace template it was copied from (it may since have changed or gone). */
  @Column({ type: 'uuid', name: 'template_id', nullable: true })
  templateId!: string | null;

  @Column({ type: 'varchar', length: 100 })
  name!: string;

  @Column({ type: 'varchar', length: 16, name: 'file_extension' })
  fileExtension!: string;

  @Column({ type: 'text' })
  body!: string;
}
