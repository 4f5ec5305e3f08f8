import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type MailStatus = 'queued' | 'sent' | 'failed';

/**
 * The outbox: every e-mail the server sends, written as `queued` before the first attempt (in the
 * same transaction as the change that caused it), then `sent` or, after the last retry, `failed`.
 * The `received*` columns hold what the local SMTP sink captured, when the sink is in use.
 */
@Entity({ name: 'mail_messages' })
@Index(['status', 'nextAttemptAt'])
export class MailMessage {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'simple-json' })
  to: string[];

  @Column({ type: 'text' })
  subject: string;

  @Column({ type: 'text' })
  text: string;

  @Column({ type: 'text' })
  status: MailStatus;

  @Column({ type: 'integer', default: 0 })
  attempts: number;

  @Column({ type: 'text', nullable: true })
  lastError: string | null;

  /** When the next delivery attempt is due; null once sent or failed. */
  @Column({ type: 'datetime', nullable: true })
  nextAttemptAt: Date | null;

  @Index()
  @Column({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime', nullable: true })
  sentAt: Date | null;

  /** The Message-ID the SMTP server accepted. */
  @Column({ type: 'text', nullable: true })
  messageId: string | null;

  @Column({ type: 'datetime', nullable: true })
  receivedAt: Date | null;

  @Column({ type: 'text', nullable: true })
  envelopeFrom: string | null;

  @Column({ type: 'simple-json', nullable: true })
  envelopeTo: string[] | null;

  /** The text body as the sink parsed it from the SMTP stream. */
  @Column({ type: 'text', nullable: true })
  receivedText: string | null;
}
