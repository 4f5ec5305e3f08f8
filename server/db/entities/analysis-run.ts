import type { ComparisonHeadline, RunStatus } from '@shared/comparisons';
import type { AnalysisSettings, ColumnMapping } from '@shared/report';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Comparison } from './comparison';
import { Holdout } from './holdout';
import { User } from './user';

/**
 * What the reader found when the run's mapping was applied to the holdout: the input's identity,
 * the row counts, and what the stored columns (run_columns) hold. The analysis worker rebuilds
 * the engine's holdout from this and the columns.
 */
export interface RunInput {
  fileName: string;
  /** The worksheet read, when the holdout is an .xlsx workbook. */
  sheet?: string;
  sha256: string;
  bytes: number;
  /** Accounts used (rows read minus rows left out). */
  n: number;
  read: {
    rowsRead: number;
    rowsUsed: number;
    rowsDroppedMissingScore: number;
    missingByColumn: Record<string, number>;
    badValue: string;
    goodValue: string | null;
    goods: number;
    bads: number;
    delimiter: string;
  };
  hasIds: boolean;
  hasExposure: boolean;
  /** Segment columns in mapping order, with their values (the stored codes index into them). */
  segments: { column: string; levels: string[] }[];
  /** Grade columns (stored as `grade.champion` / `grade.challenger` codes), when mapped. */
  grades?: { champion: { column: string; levels: string[] } | null; challenger: { column: string; levels: string[] } | null };
  /** Period column (stored as `period` codes), when mapped. */
  period?: { column: string; levels: string[] } | null;
  /** The PSI's reference sample (stored as `reference.champion` / `reference.challenger`), when one was chosen. */
  reference?: { holdoutId: number; fileName: string; sha256: string; rows: number } | null;
}

/**
 * One analysis of a comparison with a given mapping and settings. Runs are never changed once
 * finished and never removed with a new set-up: a new set-up makes a new run.
 * queued → running → done | failed; a run interrupted by a stop of the server is queued again at
 * start-up, and fails after two attempts. The report is stored as the JSON text the API serves
 * (not selected by default: load it with `addSelect('run.report')`).
 */
@Entity({ name: 'analysis_runs' })
@Index(['status', 'id'])
export class AnalysisRun {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Index()
  @Column({ type: 'integer' })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  /** The holdout this run read (a set-up may change the comparison's holdout). */
  @Index()
  @Column({ type: 'integer' })
  holdoutId: number;

  @ManyToOne(() => Holdout, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'holdoutId' })
  holdout: Holdout;

  /**
   * The PSI's reference sample (a second uploaded holdout), when the set-up chose one. A plain
   * column, added by ALTER TABLE (a foreign key would need the table rebuilt); holdouts have no
   * delete path, and its uploader counts among the comparison's authors (authors.ts).
   */
  @Index()
  @Column({ type: 'integer', nullable: true })
  referenceHoldoutId: number | null;

  @Column({ type: 'text' })
  status: RunStatus;

  /** 0 to 1. */
  @Column({ type: 'real', default: 0 })
  progress: number;

  /** What the run is doing now, in words. */
  @Column({ type: 'text', nullable: true })
  stage: string | null;

  /** Times a worker started on this run. */
  @Column({ type: 'integer', default: 0 })
  attempts: number;

  /** Why it failed, or why the last attempt failed when it was queued again. */
  @Column({ type: 'text', nullable: true })
  error: string | null;

  @Column({ type: 'text', nullable: true })
  engineVersion: string | null;

  @Column({ type: 'datetime' })
  queuedAt: Date;

  @Column({ type: 'datetime', nullable: true })
  startedAt: Date | null;

  @Column({ type: 'datetime', nullable: true })
  finishedAt: Date | null;

  /** The mapping and full settings (defaults filled in) this run used. */
  @Column({ type: 'simple-json' })
  mapping: ColumnMapping;

  @Column({ type: 'simple-json' })
  settings: AnalysisSettings;

  @Column({ type: 'simple-json' })
  input: RunInput;

  /** The report as JSON text (shared/report.ts); null until done. */
  @Column({ type: 'text', nullable: true, select: false })
  report: string | null;

  /** Headline numbers of the report, for lists; null until done. */
  @Column({ type: 'simple-json', nullable: true })
  headline: ComparisonHeadline | null;

  @Column({ type: 'integer' })
  requestedById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'requestedById' })
  requestedBy: User;
}
