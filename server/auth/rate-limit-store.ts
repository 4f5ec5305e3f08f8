import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import { now } from '../clock';
import type { DataSource } from 'typeorm';
import { rawQuery } from '../db/driver';
import { withWriteLock } from '../db/transaction';

/**
 * express-rate-limit's counters in the `rate_limit_hits` table, for several server instances on
 * one PostgreSQL database: ten failed sign-ins spread over two instances still lock the account.
 * One statement per hit (an upsert that starts a new window when the old one has passed), so no
 * two instances can lose a hit between them. Expired rows are removed now and then.
 */
export class DatabaseRateLimitStore implements Store {
  readonly localKeys = false;
  private windowMs = 60_000;
  private calls = 0;

  constructor(
    private readonly dataSource: DataSource,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await rawQuery<{ hits: number; resetAt: Date | string }>(
      this.dataSource,
      'SELECT "hits", "resetAt" FROM "rate_limit_hits" WHERE "key" = ? AND "resetAt" > ?',
      [this.prefix + key, now()],
    );
    return row ? { totalHits: row.hits, resetTime: new Date(row.resetAt) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const at = now();
    const resetAt = new Date(at.getTime() + this.windowMs);
    if (++this.calls % 100 === 0) await this.prune(at);
    const [row] = await withWriteLock(this.dataSource, () =>
      rawQuery<{ hits: number; resetAt: Date | string }>(
        this.dataSource,
        'INSERT INTO "rate_limit_hits" ("key", "hits", "resetAt") VALUES (?, 1, ?) ON CONFLICT ("key") DO UPDATE SET ' +
          '"hits" = CASE WHEN "rate_limit_hits"."resetAt" <= ? THEN 1 ELSE "rate_limit_hits"."hits" + 1 END, ' +
          '"resetAt" = CASE WHEN "rate_limit_hits"."resetAt" <= ? THEN excluded."resetAt" ELSE "rate_limit_hits"."resetAt" END ' +
          'RETURNING "hits", "resetAt"',
        [this.prefix + key, resetAt, at, at],
      ),
    );
    return { totalHits: row.hits, resetTime: new Date(row.resetAt) };
  }

  async decrement(key: string): Promise<void> {
    await withWriteLock(this.dataSource, () =>
      rawQuery(this.dataSource, 'UPDATE "rate_limit_hits" SET "hits" = "hits" - 1 WHERE "key" = ? AND "hits" > 0', [this.prefix + key]),
    );
  }

  async resetKey(key: string): Promise<void> {
    await withWriteLock(this.dataSource, () => rawQuery(this.dataSource, 'DELETE FROM "rate_limit_hits" WHERE "key" = ?', [this.prefix + key]));
  }

  private async prune(at: Date): Promise<void> {
    await withWriteLock(this.dataSource, () => rawQuery(this.dataSource, 'DELETE FROM "rate_limit_hits" WHERE "resetAt" <= ?', [at]));
  }
}
