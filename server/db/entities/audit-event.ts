import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { User } from './user';

/**
 * One entry of the append-only audit trail. Each event carries the hash of the one before it
 * (`prevHash`) and its own `hash` = SHA-256(prevHash, canonical event); see server/audit/audit.ts.
 * Database triggers refuse UPDATE and DELETE on this table.
 */
@Entity({ name: 'audit_events' })
@Index(['targetType', 'targetId'])
export class AuditEvent {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  /** Who did it; null for the system (start-up seeding, scheduled work). */
  @Column({ type: 'integer', nullable: true })
  actorId: number | null;

  @ManyToOne(() => User, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'actorId' })
  actor: User | null;

  /** The actor's name and e-mail when the event was recorded (null for the system, and for events before names were kept). */
  @Column({ type: 'text', nullable: true })
  actorName: string | null;

  @Column({ type: 'text', nullable: true })
  actorEmail: string | null;

  /** Dotted verb, e.g. `user.invited`, `comparison.submitted`. */
  @Column({ type: 'text' })
  action: string;

  /** What it acted on, e.g. `user`, `comparison`. */
  @Column({ type: 'text' })
  targetType: string;

  @Column({ type: 'text', nullable: true })
  targetId: string | null;

  /** Canonical JSON (sorted keys) of the event's details, kept as text so the hash is reproducible. */
  @Column({ type: 'text' })
  details: string;

  @Column({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'text' })
  prevHash: string;

  @Column({ type: 'text', unique: true })
  hash: string;
}
