import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique } from 'typeorm';
import { Workspace } from '../workspaces/entity';
import type { SnapSettings, TargetPolicy } from '@shared/contracts/settings';
import type { AtomJson, FlagCode, StructureResult } from '@shared/contracts/structure';

export type BatchStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';
export type StructureStatus = 'queued' | 'running' | 'done' | 'error' | 'cancelled';
export type ReviewState = 'pending' | 'accepted' | 'flagged';

/** One uploaded file of a batch (ZIP entries count as files, named by their entry path). */
export interface BatchFile {
  name: string;
  sha256: string;
  bytes: number;
  /** Detected input format, or null when the file could not be recognised. */
  format: string | null;
  structures: number;
}

/** Where a structure's time went, ms (worker side). */
export interface StructureTimings {
  /** From queueing (upload or re-snap) to a worker picking the job up. */
  queueMs: number;
  /** Perceive + ladder + snap in the engine thread. */
  engineMs: number;
  /** Writing the output files and reading them back (write-back check). */
  writeMs: number;
  /** Claiming the structure and reading its input (the result's own write is not included). */
  dbMs: number;
}

/**
 * A batch: one upload of geometries snapped with one set of settings. The counts and groups are
 * a cache of its structures' states, refreshed by the worker as results land (COUNT-based, so a
 * re-delivered job can never count twice).
 */
@Entity({ name: 'batches' })
@Index('ix_batches_workspace_created', ['workspaceId', 'createdAt'])
@Index('ix_batches_workspace_status', ['workspaceId', 'status'])
export class Batch {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'uuid', name: 'workspace_id' })
  workspaceId!: string;

  @ManyToOne(() => Workspace, { onDelete: 'CASCADE', createForeignKeyConstraints: true })
  @JoinColumn({ name: 'workspace_id' })
  workspace?: Workspace;

  @Index()
  @Column({ type: 'uuid', name: 'submitter_id' })
  submitterId!: string;

  @Column({ type: 'varchar', length: 200 })
  name!: string;

  @Column({ type: 'varchar', length: 16 })
  status!: BatchStatus;

  /** Complete SnapSettings (workspace defaults merged with the form), as the worker uses them. */
  @Column({ type: 'jsonb' })
  settings!: SnapSettings;

  @Column({ type: 'jsonb', default: () => "'[]'::jsonb" })
  files!: BatchFile[];

  @Column({ type: 'integer', default: 0 })
  total!: number;

  @Column({ type: 'integer', name: 'done_count', default: 0 })
  doneCount!: number;

  @Column({ type: 'integer', name: 'clean_count', default: 0 })
  cleanCount!: number;

  @Column({ type: 'integer', name: 'over_budget_count', default: 0 })
  overBudgetCount!: number;

  @Column({ type: 'integer', name: 'knife_edge_count', default: 0 })
  knifeEdgeCount!: number;

  @Column({ type: 'integer', name: 'error_count', default: 0 })
  errorCount!: number;

  @Column({ type: 'integer', name: 'accepted_count', default: 0 })
  acceptedCount!: number;

  @Column({ type: 'integer', name: 'flagged_count', default: 0 })
  flaggedCount!: number;

  /** Perceived groups with their counts, most common first. */
  @Column({ type: 'jsonb', default: () => "'[]'::jsonb" })
  groups!: { group: string; count: number }[];

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;

  @Column({ type: 'timestamptz', name: 'started_at', nullable: true })
  startedAt!: Date | null;

  @Column({ type: 'timestamptz', name: 'finished_at', nullable: true })
  finishedAt!: Date | null;

  /** Set once the batch-finished mail went out (the notice is sent at most once per batch). */
  @Column({ type: 'timestamptz', name: 'notified_at', nullable: true })
  notifiedAt!: Date | null;

  @Column({ type: 'uuid', name: 'signed_off_by_id', nullable: true })
  signedOffById!: string | null;

  @Column({ type: 'timestamptz', name: 'signed_off_at', nullable: true })
  signedOffAt!: Date | null;
}

/**
 * One structure (one frame of one input file) of a batch, with its input, its state and, once
 * snapped, its result. The scalar result columns are copies of fields of `result`, kept as
 * columns so the structure table can filter and sort in SQL.
 */
@Entity({ name: 'structures' })
@Unique('uq_structures_batch_seq', ['batchId', 'seq'])
@Index('ix_structures_batch_status', ['batchId', 'status'])
@Index('ix_structures_batch_perceived', ['batchId', 'perceivedGroup'])
@Index('ix_structures_batch_point_group', ['batchId', 'pointGroup'])
@Index('ix_structures_batch_review', ['batchId', 'review'])
export class Structure {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'uuid', name: 'batch_id' })
  batchId!: string;

  @ManyToOne(() => Batch, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'batch_id' })
  batch?: Batch;

  /** Copied from the batch so every query can be scoped to the caller's workspace directly. */
  @Index()
  @Column({ type: 'uuid', name: 'workspace_id' })
  workspaceId!: string;

  /** Position in the upload (files in upload order, frames in file order): the manifest's order. */
  @Column({ type: 'integer' })
  seq!: number;

  /** File name as uploaded (for ZIP entries: the entry path). A label only, never a file-system path. */
  @Column({ type: 'varchar', length: 1024, name: 'source_file' })
  sourceFile!: string;

  @Column({ type: 'integer', name: 'frame_index' })
  frameIndex!: number;

  /** Frames in the source file (output names carry the frame only when there are several). */
  @Column({ type: 'integer', name: 'frame_count' })
  frameCount!: number;

  @Column({ type: 'varchar', length: 500 })
  name!: string;

  /** Input atoms in Å, file order. Empty when the frame could not be read. */
  @Column({ type: 'jsonb', name: 'input_atoms' })
  inputAtoms!: AtomJson[];

  @Column({ type: 'integer', name: 'atom_count' })
  atomCount!: number;

  /** From the file where the format carries it; null = use the batch's default. */
  @Column({ type: 'integer', nullable: true })
  charge!: number | null;

  @Column({ type: 'integer', nullable: true })
  multiplicity!: number | null;

  /** SHA-256 (hex) of the input file this structure was read from. */
  @Column({ type: 'varchar', length: 64, name: 'input_sha256' })
  inputSha256!: string;

  @Column({ type: 'varchar', length: 16 })
  status!: StructureStatus;

  @Column({ type: 'text', nullable: true })
  error!: string | null;

  /**
   * Bumped by every re-snap: jobs carry it and a result is stored only for the current
   * revision, so a late or re-delivered job of an older request can't overwrite a newer one.
   */
  @Column({ type: 'integer', default: 0 })
  revision!: number;

  /** Target chosen for this structure by a re-snap; null = the batch's target policy. */
  @Column({ type: 'jsonb', nullable: true })
  target!: TargetPolicy | null;

  @Column({ type: 'integer', default: 0 })
  attempts!: number;

  @Column({ type: 'varchar', length: 200, nullable: true })
  formula!: string | null;

  @Column({ type: 'varchar', length: 8, name: 'perceived_group', nullable: true })
  perceivedGroup!: string | null;

  @Column({ type: 'varchar', length: 8, name: 'point_group', nullable: true })
  pointGroup!: string | null;

  @Column({ type: 'integer', name: 'group_order', nullable: true })
  groupOrder!: number | null;

  @Column({ type: 'varchar', length: 8, name: 'computational_subgroup', nullable: true })
  computationalSubgroup!: string | null;

  @Column({ type: 'double precision', name: 'symmetry_rmsd_before', nullable: true })
  symmetryRmsdBefore!: number | null;

  @Column({ type: 'double precision', name: 'symmetry_rmsd_after', nullable: true })
  symmetryRmsdAfter!: number | null;

  @Column({ type: 'double precision', name: 'displacement_rmsd', nullable: true })
  displacementRmsd!: number | null;

  @Column({ type: 'double precision', name: 'max_displacement', nullable: true })
  maxDisplacement!: number | null;

  @Column({ type: 'double precision', nullable: true })
  csm!: number | null;

  @Index('ix_structures_flags', { synchronize: false })
  @Column({ type: 'text', array: true, default: () => "'{}'::text[]" })
  flags!: FlagCode[];

  /**
   * The engine's whole result (output atoms, ladder, operations, equivalence classes,
   * transform …): JSON numbers, never numeric strings.
   */
  @Column({ type: 'jsonb', nullable: true })
  result!: StructureResult | null;

  /** Cleaned files in the batch's output formats, each already through the write-back check. */
  @Column({ type: 'jsonb', nullable: true })
  outputs!: Partial<Record<string, string>> | null;

  @Column({ type: 'varchar', length: 64, name: 'engine_version', nullable: true })
  engineVersion!: string | null;

  @Column({ type: 'jsonb', nullable: true })
  timings!: StructureTimings | null;

  @Column({ type: 'varchar', length: 16, default: 'pending' })
  review!: ReviewState;

  @Column({ type: 'timestamptz', name: 'queued_at', default: () => 'now()' })
  queuedAt!: Date;

  @Column({ type: 'timestamptz', name: 'started_at', nullable: true })
  startedAt!: Date | null;

  @Column({ type: 'timestamptz', name: 'finished_at', nullable: true })
  finishedAt!: Date | null;
}
