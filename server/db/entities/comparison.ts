import type { ComparisonState } from '@shared/comparisons';
import type { AnalysisSettings, ColumnMapping } from '@shared/report';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Holdout } from './holdout';
import { User } from './user';

/**
 * A champion–challenger comparison: a holdout, how its columns map to the engine's inputs, the
 * analysis settings, and where it stands in the workflow (shared/comparisons.ts
 * `comparisonStates`). State changes go through `transition()` in
 * server/comparisons/state.ts, which checks the state and writes the audit event.
 * Its analysis runs (analysis_runs) keep every result; the newest done run is the current one.
 */
@Entity({ name: 'comparisons' })
@Index(['state', 'updatedAt'])
export class Comparison {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'text' })
  name: string;

  @Column({ type: 'text', nullable: true })
  description: string | null;

  @Index()
  @Column({ type: 'integer' })
  holdoutId: number;

  @ManyToOne(() => Holdout, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'holdoutId' })
  holdout: Holdout;

  /** Null while the comparison waits for its mapping. */
  @Column({ type: 'simple-json', nullable: true })
  mapping: ColumnMapping | null;

  /** The full settings (defaults filled in) of the latest set-up; null before the first. */
  @Column({ type: 'simple-json', nullable: true })
  settings: AnalysisSettings | null;

  @Column({ type: 'text' })
  state: ComparisonState;

  @Column({ type: 'integer' })
  createdById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'createdById' })
  createdBy: User;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /**
   * The adoption-policy version in force when it was last submitted for review: it governs the
   * review and the decision (quorum, verdict) until the comparison is submitted again. Null before
   * the first submission.
   */
  @Column({ type: 'integer', nullable: true })
  governingPolicyVersion: number | null;

  @Column({ type: 'datetime' })
  updatedAt: Date;
}
