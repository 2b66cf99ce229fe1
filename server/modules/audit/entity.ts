import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * One line of a workspace's audit log: who did what, when. Sign-ins belong to no workspace
 * (`workspaceId` null); an owner sees those of their current members.
 */
@Entity({ name: 'audit_entries' })
@Index('idx_audit_workspace_created', ['workspaceId', 'createdAt'])
export class AuditEntry {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'uuid', name: 'workspace_id', nullable: true })
  workspaceId!: string | null;

  /** The user who acted; null for the system (seeding, operator commands). */
  @Index()
  @Column({ type: 'uuid', name: 'actor_id', nullable: true })
  actorId!: string | null;

  @Column({ type: 'varchar', length: 64 })
  action!: string;

  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  detail!: Record<string, unknown>;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
