import type { ChosenModel, VoteChoice } from '@shared/governance';
import type { MixedStrategyResult } from '@shared/mixed-strategy';
import { Column, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { AnalysisRun } from './analysis-run';
import { Comparison } from './comparison';
import { PolicyVersion } from './policy-version';
import { Review } from './review';
import { User } from './user';
import { VerdictRecord } from './verdict-record';

/**
 * The committee's adoption decision on a validated comparison: one per comparison (it ends the
 * workflow), with the run, the validating review, the policy version in force and the newest
 * verdict record of the run at the time. Never changed or removed (database triggers refuse both).
 */
@Entity({ name: 'decisions' })
export class Decision {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'integer', unique: true })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  @Column({ type: 'integer' })
  runId: number;

  @ManyToOne(() => AnalysisRun, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'runId' })
  run: AnalysisRun;

  @Column({ type: 'integer' })
  reviewId: number;

  @ManyToOne(() => Review, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'reviewId' })
  review: Review;

  @Column({ type: 'integer' })
  policyVersion: number;

  @ManyToOne(() => PolicyVersion, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'policyVersion' })
  policy: PolicyVersion;

  /** The run's newest verdict record when the decision was made; null if it had none. */
  @Column({ type: 'integer', nullable: true })
  verdictId: number | null;

  @ManyToOne(() => VerdictRecord, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'verdictId' })
  verdict: VerdictRecord | null;

  @Column({ type: 'text' })
  outcome: VoteChoice;

  @Column({ type: 'text' })
  rationale: string;

  @Column({ type: 'text', nullable: true })
  conditions: string | null;

  /** ISO date (YYYY-MM-DD). */
  @Column({ type: 'text', nullable: true })
  effectiveDate: string | null;

  @Column({ type: 'integer' })
  decidedById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'decidedById' })
  decidedBy: User;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** The decider's name and e-mail when they decided (a later rename does not rewrite the record). */
  @Column({ type: 'text', nullable: true })
  decidedByName: string | null;

  @Column({ type: 'text', nullable: true })
  decidedByEmail: string | null;

  /** The counting votes when the decision was recorded: { adopt, keep, defer }. */
  @Column({ type: 'simple-json', nullable: true })
  tally: Record<VoteChoice, number> | null;

  /** The decider acknowledged deciding against the majority of votes or without the quorum. */
  @Column({ type: 'boolean', default: false })
  acknowledgedAgainstRecord: boolean;

  /**
   * Adoption with exceptions: segment values that keep the champion (column and value), with the
   * mixed strategy's figures as computed when the decision was recorded. Null for a plain decision.
   */
  @Column({ type: 'simple-json', nullable: true })
  strategy: MixedStrategyResult | null;

  /** The model chosen: the champion (keep) or the adopted challenger (adopt); null for defer and for decisions before several challengers. */
  @Column({ type: 'simple-json', nullable: true })
  chosen: ChosenModel | null;
}
