import { Column, Entity, PrimaryColumn } from 'typeorm';

/**
 * A rate limit's counter kept in the database, so that every server instance counts the same
 * attempts (auth/rate-limit-store.ts; used on PostgreSQL, where several instances share one
 * database). `key` is the limit's prefix, the account and the client address.
 */
@Entity({ name: 'rate_limit_hits' })
export class RateLimitHit {
  @PrimaryColumn({ type: 'text' })
  key: string;

  @Column({ type: 'integer' })
  hits: number;

  @Column({ type: 'datetime' })
  resetAt: Date;
}
