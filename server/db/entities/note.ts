import type { z } from 'zod';
import type { noteAnchorSchema } from '@shared/governance';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Comparison } from './comparison';
import { CutoffScenario } from './cutoff-scenario';
import { User } from './user';

/**
 * A note on a comparison: the discussion thread (`discussion`), or the policy role's annotation
 * on one of the swap sets, optionally tied to a saved cut-off scenario. Notes are kept as
 * written: there is no edit or delete.
 */
@Entity({ name: 'notes' })
@Index(['comparisonId', 'id'])
export class Note {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'integer' })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  @Column({ type: 'text' })
  anchor: z.infer<typeof noteAnchorSchema>;

  @Column({ type: 'text' })
  body: string;

  @Column({ type: 'integer', nullable: true })
  scenarioId: number | null;

  @ManyToOne(() => CutoffScenario, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'scenarioId' })
  scenario: CutoffScenario | null;

  @Column({ type: 'integer' })
  authorId: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'authorId' })
  author: User;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** Written after the comparison was decided: not part of what the committee saw. */
  @Column({ type: 'boolean', default: false })
  afterDecision: boolean;
}
