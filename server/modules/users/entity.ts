import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** A person who signs in (through the OAuth provider). */
@Entity({ name: 'users' })
export class User {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  /** Provider login (GitHub username). */
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 100 })
  login!: string;

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 320 })
  email!: string;

  @Column({ type: 'varchar', length: 200 })
  name!: string;

  /** The provider's stable numeric/string id, once the user has signed in through it. */
  @Column({ type: 'varchar', length: 100, name: 'provider_id', nullable: true, unique: true })
  providerId!: string | null;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
