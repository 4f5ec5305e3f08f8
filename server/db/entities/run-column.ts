import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { AnalysisRun } from './analysis-run';

/**
 * One column of a run's input in the engine's typed-array form, as raw bytes (little-endian):
 * `bad` (Uint8), `champion`, `challenger`, `exposure` (Float64), `segment.<i>` (Uint32 codes),
 * `ids` (UTF-8, NUL-separated), and, once the run is done, `order.champion` and
 * `order.challenger` (Uint32: accounts riskiest first). See server/holdouts/columns.ts.
 */
@Entity({ name: 'run_columns' })
export class RunColumn {
  @PrimaryColumn({ type: 'integer' })
  runId: number;

  @PrimaryColumn({ type: 'text' })
  name: string;

  @ManyToOne(() => AnalysisRun, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'runId' })
  run: AnalysisRun;

  @Column({ type: 'blob' })
  data: Buffer;
}
