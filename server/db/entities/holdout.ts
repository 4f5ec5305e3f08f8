import type { MappingGuess } from '@shared/comparisons';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { User } from './user';

/** What the reader found in each column of an uploaded file (shared/comparisons.ts holdoutColumnSchema). */
export interface StoredHoldoutColumn {
  name: string;
  kind: 'numeric' | 'categorical' | 'text';
  distinct: number;
  missing: number;
}

/**
 * An uploaded holdout file: what the reader found in it, and (in holdout_chunks) the file's bytes
 * as uploaded, so that a later mapping can be read from them again. The row and its chunks are
 * written in one transaction. `fileName` is the client's name, sanitised, shown to people and
 * never used as a path; the id is the database's own.
 */
@Entity({ name: 'holdouts' })
export class Holdout {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'text' })
  fileName: string;

  /** Hex SHA-256 of the bytes as uploaded. */
  @Index()
  @Column({ type: 'text' })
  sha256: string;

  /** File size in bytes. */
  @Column({ type: 'integer' })
  bytes: number;

  /** Data rows (blank lines not counted). */
  @Column({ type: 'integer' })
  rowCount: number;

  /** The worksheet read, for an .xlsx workbook (chosen at upload, else its first); null for CSV. Every later reading uses it. */
  @Column({ type: 'text', nullable: true })
  sheet: string | null;

  /** The field separator the reader detected: `,`, `;` or a tab. */
  @Column({ type: 'text' })
  delimiter: string;

  @Column({ type: 'simple-json' })
  columns: StoredHoldoutColumn[];

  /** The first 20 data rows as text, in column order. */
  @Column({ type: 'simple-json' })
  preview: string[][];

  /** The reader's proposal for the mapping. */
  @Column({ type: 'simple-json' })
  guess: MappingGuess;

  /** Bytes per stored chunk (the last one may be shorter). */
  @Column({ type: 'integer' })
  chunkSize: number;

  @Column({ type: 'integer' })
  chunkCount: number;

  @Column({ type: 'integer' })
  uploadedById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'uploadedById' })
  uploadedBy: User;

  @Column({ type: 'datetime' })
  uploadedAt: Date;
}
