import { Column, Entity, Index, PrimaryColumn } from 'typeorm';

/**
 * Browser sessions, written by connect-pg-simple (express-session store). The table shape is
 * the one that store expects (sid, sess, expire); it is created by a migration, not by the
 * store's auto-create, so the schema has one owner.
 */
@Entity({ name: 'sessions' })
export class SessionRecord {
  @PrimaryColumn({ type: 'varchar', length: 255 })
  sid!: string;

  @Column({ type: 'json' })
  sess!: Record<string, unknown>;

  @Index('idx_sessions_expire')
  @Column({ type: 'timestamp', precision: 6 })
  expire!: Date;
}
