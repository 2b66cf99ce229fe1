import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Batch } from '../batches/entity';

export type ReviewDecision = 'accepted' | 'flagged' | 'signed-off';

/**
 * One review decision: a structure accepted or flagged with a comment, or a batch signed off
 * (structureId null). Append-only; a structure's current state is its latest decision.
 */
@Entity({ name: 'review_events' })
@Index('ix_review_events_batch_created', ['batchId', 'createdAt'])
export class ReviewEvent {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Index()
  @Column({ type: 'uuid', name: 'workspace_id' })
  workspaceId!: string;

  @Column({ type: 'uuid', name: 'batch_id' })
  batchId!: string;

  @ManyToOne(() => Batch, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'batch_id' })
  batch?: Batch;

  @Index()
  @Column({ type: 'uuid', name: 'structure_id', nullable: true })
  structureId!: string | null;

  @Column({ type: 'varchar', length: 16 })
  decision!: ReviewDecision;

  @Column({ type: 'text', default: '' })
  comment!: string;

  @Column({ type: 'uuid', name: 'reviewer_id' })
  reviewerId!: string;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
