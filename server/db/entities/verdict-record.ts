import type { ChallengerVerdict } from '@shared/governance';
import type { Criterion, VerdictOutcome } from '@shared/report';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { AnalysisRun } from './analysis-run';
import { Comparison } from './comparison';
import { PolicyVersion } from './policy-version';
import { User } from './user';

/**
 * A verdict as it was given: one analysis run judged under one adoption-policy version. Written
 * when a run finishes (the report's own verdict) and on each re-evaluation under the current
 * policy; never changed or removed afterwards (database triggers refuse both), so a later policy
 * never rewrites what was advised.
 */
@Entity({ name: 'verdict_records' })
@Index(['comparisonId', 'id'])
export class VerdictRecord {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'integer' })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  @Index()
  @Column({ type: 'integer' })
  runId: number;

  @ManyToOne(() => AnalysisRun, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'runId' })
  run: AnalysisRun;

  @Column({ type: 'integer' })
  policyVersion: number;

  @ManyToOne(() => PolicyVersion, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'policyVersion' })
  policy: PolicyVersion;

  @Column({ type: 'text' })
  outcome: VerdictOutcome;

  @Column({ type: 'simple-json' })
  criteria: Criterion[];

  @Column({ type: 'text' })
  summary: string;

  /** Who asked for the re-evaluation; null when the run's own verdict was recorded as it finished. */
  @Column({ type: 'integer', nullable: true })
  createdById: number | null;

  @ManyToOne(() => User, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'createdById' })
  createdBy: User | null;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** Several challengers: every challenger's verdict under the same policy version (index 0 = the record's own); null before them. */
  @Column({ type: 'simple-json', nullable: true })
  challengers: ChallengerVerdict[] | null;

  /** The recommended challenger's index; null for none (and for records before several challengers). */
  @Column({ type: 'integer', nullable: true })
  recommended: number | null;

  /** The sentence stating the choice; null before several challengers. */
  @Column({ type: 'text', nullable: true })
  choiceSummary: string | null;
}
