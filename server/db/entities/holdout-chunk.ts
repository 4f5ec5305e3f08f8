import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Holdout } from './holdout';

/**
 * One fixed-size piece of an uploaded file's bytes, in order (`seq` from 0). Reassembled, the
 * chunks are the file exactly (its SHA-256 is the holdout's). See server/holdouts/storage.ts.
 */
@Entity({ name: 'holdout_chunks' })
export class HoldoutChunk {
  @PrimaryColumn({ type: 'integer' })
  holdoutId: number;

  @PrimaryColumn({ type: 'integer' })
  seq: number;

  @ManyToOne(() => Holdout, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'holdoutId' })
  holdout: Holdout;

  @Column({ type: 'blob' })
  data: Buffer;
}
