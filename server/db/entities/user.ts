import type { Role } from '@shared/roles';
import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A person who may sign in. Never deleted: people are deactivated, so the audit trail keeps its actors. */
@Entity({ name: 'users' })
export class User {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  /** Stored lower-case (the input schemas normalise it); unique. */
  @Column({ type: 'text', unique: true })
  email: string;

  @Column({ type: 'text' })
  name: string;

  /** bcrypt hash; null until an invited person sets a password. */
  @Column({ type: 'text', nullable: true })
  passwordHash: string | null;

  /** One or more of shared/roles.ts, in that order. */
  @Column({ type: 'simple-json' })
  roles: Role[];

  @Column({ type: 'boolean', default: false })
  active: boolean;

  @Column({ type: 'datetime' })
  createdAt: Date;
}
