import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, Unique } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import type { SnapSettings } from '@shared/contracts/settings';

/** One research group or team. Nobody sees another workspace's data. */
@Entity({ name: 'workspaces' })
export class Workspace {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 64 })
  slug!: string;

  @Column({ type: 'varchar', length: 200 })
  name!: string;

  /** Default snap settings for new batches (owners edit them). Partial: zod fills the rest. */
  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  defaults!: Partial<SnapSettings>;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}

/** A user's role in one workspace. */
@Entity({ name: 'memberships' })
@Unique('uq_membership_workspace_user', ['workspaceId', 'userId'])
export class Membership {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Index()
  @Column({ type: 'uuid', name: 'workspace_id' })
  workspaceId!: string;

  @Index()
  @Column({ type: 'uuid', name: 'user_id' })
  userId!: string;

  @Column({ type: 'varchar', length: 16 })
  role!: Role;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
