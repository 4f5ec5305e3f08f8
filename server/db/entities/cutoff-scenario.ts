import type { SwapSets } from '@shared/report';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { AnalysisRun } from './analysis-run';
import { Comparison } from './comparison';
import { User } from './user';

/**
 * Cut-offs (or an approval rate) the policy role saved for a comparison, with the swap sets they
 * gave on the run that was current at the time.
 */
@Entity({ name: 'cutoff_scenarios' })
export class CutoffScenario {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Index()
  @Column({ type: 'integer' })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  /** The run the swap sets were computed on. */
  @Index()
  @Column({ type: 'integer' })
  runId: number;

  @ManyToOne(() => AnalysisRun, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'runId' })
  run: AnalysisRun;

  @Column({ type: 'text' })
  name: string;

  /** The cut-offs in each model's own units: as given, or the ones the approval rate gave. */
  @Column({ type: 'real' })
  championCutoff: number;

  @Column({ type: 'real' })
  challengerCutoff: number;

  /** The approval rate asked for; null when cut-offs were given. */
  @Column({ type: 'real', nullable: true })
  approvalRate: number | null;

  @Column({ type: 'text' })
  note: string;

  /** The swap sets at save time. */
  @Column({ type: 'simple-json' })
  swap: SwapSets;

  @Column({ type: 'integer' })
  createdById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'createdById' })
  createdBy: User;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** Saved after the comparison was decided: not part of what the committee saw. */
  @Column({ type: 'boolean', default: false })
  afterDecision: boolean;
}
