import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { AnalysisRun } from './analysis-run';
import { Comparison } from './comparison';
import { User } from './user';

/**
 * An analyst's review of a comparison in review: the findings and the outcome (validated, or
 * returned to the modeler), on the run that was current. A validating review opens a round of
 * committee votes (votes.reviewId). Never changed or removed (database triggers refuse both).
 */
@Entity({ name: 'reviews' })
@Index(['comparisonId', 'id'])
export class Review {
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

  @Column({ type: 'text' })
  outcome: 'validated' | 'returned';

  @Column({ type: 'text' })
  findings: string;

  @Column({ type: 'integer' })
  reviewerId: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'reviewerId' })
  reviewer: User;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** The reviewer's name and e-mail at the time (a later rename does not rewrite the record). */
  @Column({ type: 'text', nullable: true })
  reviewerName: string | null;

  @Column({ type: 'text', nullable: true })
  reviewerEmail: string | null;
}
