import type { AdoptionPolicy } from '@shared/policy';
import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { User } from './user';

/** The policy's fields as stored (the version is the row's key). */
export type StoredPolicy = Omit<AdoptionPolicy, 'version'>;

/**
 * One version of the adoption policy (shared/policy.ts). Every change by an admin is a new row;
 * stored rows are never changed or removed (database triggers refuse both), so a verdict that
 * names a version can always be read back under the exact rules it used. Version 1 is the
 * default policy, written by the migration. The newest version is the current one.
 */
@Entity({ name: 'policy_versions' })
export class PolicyVersion {
  @PrimaryColumn({ type: 'integer' })
  version: number;

  @Column({ type: 'simple-json' })
  policy: StoredPolicy;

  /** Why the admin changed it. */
  @Column({ type: 'text' })
  reason: string;

  /** Null for version 1 (the default, written by the migration). */
  @Column({ type: 'integer', nullable: true })
  createdById: number | null;

  @ManyToOne(() => User, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'createdById' })
  createdBy: User | null;

  @Column({ type: 'datetime' })
  createdAt: Date;
}
