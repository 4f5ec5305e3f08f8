import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { User } from './user';

export type TokenPurpose = 'invitation' | 'password-reset';

/**
 * A one-time link sent by e-mail. Only the SHA-256 of the token is stored, so a copy of the
 * database does not hold usable links. `usedAt` is set when the link is used or superseded.
 */
@Entity({ name: 'one_time_tokens' })
export class OneTimeToken {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Index()
  @Column({ type: 'integer' })
  userId: number;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user: User;

  @Column({ type: 'text' })
  purpose: TokenPurpose;

  /** Hex SHA-256 of the token sent in the link. */
  @Column({ type: 'text', unique: true })
  tokenHash: string;

  @Column({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime' })
  expiresAt: Date;

  @Column({ type: 'datetime', nullable: true })
  usedAt: Date | null;
}
