import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/**
 * An upload received in full into the upload folder (UPLOAD_DIR) and not yet stored as a holdout
 * (holdouts/staged-uploads.ts). Written before the file is read and stored, removed in the same
 * transaction that stores it (or with the file when the file is refused). A row left behind means
 * the instance that received it stopped mid-way: once `claimedUntil` has passed, any instance
 * sharing the folder claims it and finishes storing it, or removes it and its file.
 */
@Entity({ name: 'staged_uploads' })
export class StagedUpload {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  /** The staged file's name in the upload folder (a random name, never the client's). */
  @Column({ type: 'text' })
  file: string;

  /** The name the client gave the file. */
  @Column({ type: 'text' })
  originalName: string;

  /** For a workbook: the worksheet asked for; null for the first. */
  @Column({ type: 'text', nullable: true })
  sheet: string | null;

  @Column({ type: 'integer' })
  uploadedById: number;

  @Column({ type: 'datetime' })
  receivedAt: Date;

  /** The instance storing it holds it until then (renewed while it works); afterwards it is anyone's to finish. */
  @Column({ type: 'datetime' })
  claimedUntil: Date;

  /** Instances that took it up after the first (each a stop of the one before). */
  @Column({ type: 'integer', default: 0 })
  takeovers: number;
}
