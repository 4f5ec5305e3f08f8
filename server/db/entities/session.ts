import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { User } from './user';

/** An express-session session (server/auth/session-store.ts). `userId` lets deactivation end them. */
@Entity({ name: 'sessions' })
export class Session {
  @PrimaryColumn({ type: 'text' })
  sid: string;

  /** The session as JSON. */
  @Column({ type: 'text' })
  data: string;

  @Index()
  @Column({ type: 'datetime' })
  expiresAt: Date;

  @Index()
  @Column({ type: 'integer', nullable: true })
  userId: number | null;

  @ManyToOne(() => User, { onDelete: 'CASCADE', nullable: true })
  @JoinColumn({ name: 'userId' })
  user: User | null;
}
