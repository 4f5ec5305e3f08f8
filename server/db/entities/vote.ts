import type { VoteChoice } from '@shared/governance';
import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Comparison } from './comparison';
import { Review } from './review';
import { User } from './user';

/**
 * A committee member's vote in one validation round (the validating review, `reviewId`). Votes
 * are appended, never changed: a member who votes again adds a row that replaces their earlier
 * vote (the newest row per voter and round counts), so every vote cast stays on record.
 * Database triggers refuse UPDATE and DELETE.
 */
@Entity({ name: 'votes' })
@Index(['reviewId', 'voterId'])
export class Vote {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Index()
  @Column({ type: 'integer' })
  comparisonId: number;

  @ManyToOne(() => Comparison, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'comparisonId' })
  comparison: Comparison;

  @Column({ type: 'integer' })
  reviewId: number;

  @ManyToOne(() => Review, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'reviewId' })
  review: Review;

  @Column({ type: 'integer' })
  voterId: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'voterId' })
  voter: User;

  @Column({ type: 'text' })
  vote: VoteChoice;

  /** With vote adopt: the challenger's index in the report's `challengers` (0 = primary); null otherwise and for votes cast before several challengers. */
  @Column({ type: 'integer', nullable: true })
  challenger: number | null;

  @Column({ type: 'text' })
  comment: string;

  /** The vote of the same person in the same round that this one replaced; null for a first vote. */
  @Column({ type: 'integer', nullable: true })
  replacesId: number | null;

  @ManyToOne(() => Vote, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'replacesId' })
  replaces: Vote | null;

  @Column({ type: 'datetime' })
  createdAt: Date;

  /** The voter's name and e-mail at the time (a later rename does not rewrite the record). */
  @Column({ type: 'text', nullable: true })
  voterName: string | null;

  @Column({ type: 'text', nullable: true })
  voterEmail: string | null;
}
