import type { Transporter } from 'nodemailer';
import { In, LessThanOrEqual, MoreThan, type DataSource, type EntityManager } from 'typeorm';
import { now } from '../clock';
import { MailMessage } from '../db/entities/index';
import { isPostgres } from '../db/driver';
import { inTransaction, withWriteLock } from '../db/transaction';
import type { Logger } from '../log';

/**
 * Outgoing e-mail. A message is first written to the outbox as `queued` — inside the caller's
 * transaction, so it exists exactly when the change it announces does — and then delivered over
 * SMTP by a small in-process loop. A failed attempt is kept with its error and retried with
 * exponential backoff (retryBaseMs · 2^(attempt−1), capped at retryMaxMs); after maxAttempts it
 * is marked `failed`. Queued messages left by a previous run are retried at start.
 */

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

export interface MailerOptions {
  from: string;
  log: Logger;
  retryBaseMs?: number;
  retryMaxMs?: number;
  maxAttempts?: number;
  /** How often the loop looks for messages whose retry is due. */
  pollMs?: number;
}

/** The header that lets the local sink match what it receives to the outbox record. */
export const outboxIdHeader = 'X-Scorecourt-Outbox-Id';

/** How long a mailer holds a message it is sending before another may try it (longer than any SMTP conversation). */
const claimMs = 5 * 60_000;

export class Mailer {
  private readonly retryBaseMs: number;
  private readonly retryMaxMs: number;
  readonly maxAttempts: number;
  private readonly pollMs: number;
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private again = false;
  private stopped = false;

  constructor(
    private readonly dataSource: DataSource,
    private readonly transport: Transporter,
    private readonly options: MailerOptions,
  ) {
    this.retryBaseMs = options.retryBaseMs ?? 30_000;
    this.retryMaxMs = options.retryMaxMs ?? 60 * 60_000;
    this.maxAttempts = options.maxAttempts ?? 8;
    this.pollMs = options.pollMs ?? 5_000;
  }

  /** Writes a message to the outbox; call with the manager of the transaction that causes it, then `kick()` after commit. */
  async queue(manager: EntityManager, mail: OutgoingMail): Promise<MailMessage> {
    const to = (Array.isArray(mail.to) ? mail.to : [mail.to]).map((address) => address.trim()).filter(Boolean);
    if (to.length === 0) throw new Error('an e-mail needs at least one recipient');
    const at = now();
    return manager.getRepository(MailMessage).save(
      manager.getRepository(MailMessage).create({
        to,
        subject: mail.subject,
        text: mail.text,
        status: 'queued',
        attempts: 0,
        lastError: null,
        nextAttemptAt: at,
        createdAt: at,
        sentAt: null,
      }),
    );
  }

  /** Queues a message in its own transaction and starts delivery. */
  async send(mail: OutgoingMail): Promise<MailMessage> {
    const message = await inTransaction(this.dataSource, (manager) => this.queue(manager, mail));
    this.kick();
    return message;
  }

  /** Starts a delivery pass soon (after the current transaction has committed). */
  kick(): void {
    if (this.stopped) return;
    setImmediate(() => {
      this.deliverDue().catch((error: unknown) => this.options.log.error('mail delivery pass failed', error));
    });
  }

  /** Delivers every queued message that is due; one pass at a time, another one if kicked meanwhile. */
  deliverDue(): Promise<void> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      try {
        do {
          this.again = false;
          await this.pass();
        } while (this.again && !this.stopped);
      } finally {
        this.running = null;
      }
    })();
    return this.running;
  }

  /** Resolves when no delivery pass is running (tests use it). */
  async whenIdle(): Promise<void> {
    while (this.running) await this.running;
  }

  private async pass(): Promise<void> {
    const due = await this.dataSource.getRepository(MailMessage).find({
      where: { status: 'queued', nextAttemptAt: LessThanOrEqual(now()) },
      order: { id: 'ASC' },
      take: 50,
    });
    for (const message of due) {
      if (this.stopped) return;
      await this.attempt(message);
    }
    if (due.length === 50) this.again = true;
  }

  private async attempt(message: MailMessage): Promise<void> {
    const attempts = message.attempts + 1;
    const repository = this.dataSource.getRepository(MailMessage);
    // Claimed for a few minutes first: another server's mailer on the same database (PostgreSQL)
    // skips it meanwhile, so a message is not sent twice by two instances.
    const claimed = await withWriteLock(this.dataSource, () =>
      repository.update({ id: message.id, status: 'queued', nextAttemptAt: LessThanOrEqual(now()) }, { nextAttemptAt: new Date(now().getTime() + claimMs) }),
    );
    if (!claimed.affected) return;
    try {
      const info = (await this.transport.sendMail({
        from: this.options.from,
        to: message.to,
        subject: message.subject,
        text: message.text,
        headers: { [outboxIdHeader]: String(message.id) },
      })) as { messageId?: string };
      await withWriteLock(this.dataSource, () =>
        repository.update(
          { id: message.id },
          { status: 'sent', attempts, sentAt: now(), nextAttemptAt: null, lastError: null, messageId: info.messageId ?? null },
        ),
      );
      this.options.log.info(`mail ${message.id} sent to ${message.to.join(', ')}: ${message.subject}`);
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error);
      const giveUp = attempts >= this.maxAttempts;
      const delay = Math.min(this.retryBaseMs * 2 ** (attempts - 1), this.retryMaxMs);
      await withWriteLock(this.dataSource, () =>
        repository.update(
          { id: message.id },
          {
            status: giveUp ? 'failed' : 'queued',
            attempts,
            lastError: reason.slice(0, 1000),
            nextAttemptAt: giveUp ? null : new Date(now().getTime() + delay),
          },
        ),
      );
      this.options.log.warn(
        `mail ${message.id} attempt ${attempts} failed: ${reason}${giveUp ? ' — giving up' : ` — retrying in ${Math.round(delay / 1000)} s`}`,
      );
    }
  }

  /**
   * Retries what a previous run left queued, then keeps looking for due retries. On PostgreSQL
   * other instances may be sending some of the queued messages right now (claimed for at most
   * `claimMs`): only messages waiting longer than a claim are made due now; the others come due
   * within five minutes anyway.
   */
  async start(): Promise<void> {
    this.stopped = false;
    const waiting = isPostgres(this.dataSource) ? { nextAttemptAt: MoreThan(new Date(now().getTime() + claimMs)) } : {};
    await withWriteLock(this.dataSource, () =>
      this.dataSource.getRepository(MailMessage).update({ status: In(['queued']), ...waiting }, { nextAttemptAt: now() }),
    );
    this.timer = setInterval(() => this.kick(), this.pollMs);
    this.timer.unref();
    this.kick();
  }

  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.whenIdle();
    this.transport.close();
  }
}
