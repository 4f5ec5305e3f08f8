import session from 'express-session';
import { now } from '../clock';
import { LessThan, type DataSource } from 'typeorm';
import { Session } from '../db/entities/index';
import { isPostgres, rawQuery } from '../db/driver';
import { withWriteLock } from '../db/transaction';
import type { Logger } from '../log';

/**
 * express-session store on the `sessions` table. Sessions survive restarts; each row records the
 * signed-in person (`userId`) so deactivating someone can end their sessions at once. Expired
 * rows are ignored when read and pruned every few minutes.
 *
 * Only signed-in sessions are written to the database. A session without a person (someone on the
 * sign-in page who fetched a CSRF token) lives in memory, at most `anonymousMax` of them for at
 * most two hours, oldest dropped first: asking for tokens without signing in costs no disk (5,000
 * anonymous calls left 5,000 rows for 8 hours before). Such a session is lost on a restart; the
 * client fetches a new token when its old one is refused.
 *
 * On PostgreSQL, where several server instances behind a load balancer share the database, a
 * session without a person is stored too (for at most two hours, pruned like the others): the
 * CSRF token fetched through one instance must be known to the instance that receives the
 * sign-in. The expiry cache below then only skips touches; a stale entry costs one write.
 */
export class SqliteSessionStore extends session.Store {
  private readonly timer: NodeJS.Timeout;
  /**
   * The expiry each session has in its row, as last read or written here (this process is the
   * only writer), so that a rolling touch — every request — is written only when it would move
   * the expiry by more than a minute, without a write statement to find that out.
   */
  private readonly storedExpiry = new Map<string, number>();
  /** Sessions without a signed-in person, in memory only (insertion order: oldest first). */
  private readonly anonymous = new Map<string, { data: string; expiresAt: number }>();
  static readonly anonymousMax = 20_000;
  /** SQLite: sessions without a person stay in this process; PostgreSQL: stored, for every instance. */
  private readonly anonymousInMemory: boolean;
  static readonly anonymousTtlMs = 2 * 60 * 60_000;

  constructor(
    private readonly dataSource: DataSource,
    private readonly log: Logger,
    private readonly options: { defaultTtlMs: number; pruneEveryMs: number } = { defaultTtlMs: 86_400_000, pruneEveryMs: 10 * 60_000 },
  ) {
    super();
    this.anonymousInMemory = !isPostgres(dataSource);
    this.timer = setInterval(() => {
      this.prune().catch((error: unknown) => this.log.warn('session prune failed', error));
    }, this.options.pruneEveryMs);
    this.timer.unref();
  }

  private get repository() {
    return this.dataSource.getRepository(Session);
  }

  private expiry(data: session.SessionData): Date {
    const expires = data.cookie?.expires;
    if (expires) return new Date(expires);
    return new Date(now().getTime() + this.options.defaultTtlMs);
  }

  /** The expiry a stored row gets: a session without a person (stored on PostgreSQL only) lasts two hours at most. */
  private rowExpiry(data: session.SessionData): Date {
    const expiry = this.expiry(data);
    if (SqliteSessionStore.userIdOf(data) !== null) return expiry;
    return new Date(Math.min(expiry.getTime(), now().getTime() + SqliteSessionStore.anonymousTtlMs));
  }

  private static userIdOf(data: session.SessionData): number | null {
    const user = (data as { passport?: { user?: unknown } }).passport?.user;
    return typeof user === 'number' ? user : null;
  }

  private remember(sid: string, expiresAt: number): void {
    if (this.storedExpiry.size >= 50_000) this.storedExpiry.clear();
    this.storedExpiry.set(sid, expiresAt);
  }

  private keepAnonymous(sid: string, data: session.SessionData): void {
    this.anonymous.delete(sid);
    if (this.anonymous.size >= SqliteSessionStore.anonymousMax) this.anonymous.delete(this.anonymous.keys().next().value!);
    const expiresAt = Math.min(this.expiry(data).getTime(), now().getTime() + SqliteSessionStore.anonymousTtlMs);
    this.anonymous.set(sid, { data: JSON.stringify(data), expiresAt });
  }

  override get(sid: string, callback: (err: unknown, session?: session.SessionData | null) => void): void {
    const kept = this.anonymous.get(sid);
    if (kept) {
      if (kept.expiresAt > now().getTime()) return callback(null, JSON.parse(kept.data) as session.SessionData);
      this.anonymous.delete(sid);
      return callback(null, null);
    }
    // A plain query: this runs on every request, and the row needs no entity.
    rawQuery<{ data: string; expiresAt: string | Date }>(this.dataSource, 'SELECT "data", "expiresAt" FROM "sessions" WHERE "sid" = ?', [sid])
      .then(([row]) => {
        if (!row) {
          this.storedExpiry.delete(sid);
          return callback(null, null);
        }
        const expiresAt = storedDate(row.expiresAt);
        if (!(expiresAt > now().getTime())) {
          this.destroy(sid);
          return callback(null, null);
        }
        this.remember(sid, expiresAt);
        callback(null, JSON.parse(row.data) as session.SessionData);
      })
      .catch((error: unknown) => callback(error));
  }

  override set(sid: string, data: session.SessionData, callback?: (err?: unknown) => void): void {
    if (SqliteSessionStore.userIdOf(data) === null && this.anonymousInMemory) {
      this.keepAnonymous(sid, data);
      // A stored session that no longer has a person (signed out without a new id) leaves the database.
      if (!this.storedExpiry.has(sid)) {
        callback?.();
        return;
      }
      this.storedExpiry.delete(sid);
      withWriteLock(this.dataSource, () => this.repository.delete({ sid }))
        .then(() => callback?.())
        .catch((error: unknown) => callback?.(error));
      return;
    }
    this.anonymous.delete(sid);
    const row = { sid, data: JSON.stringify(data), expiresAt: this.rowExpiry(data), userId: SqliteSessionStore.userIdOf(data) };
    withWriteLock(this.dataSource, () => this.repository.upsert(row, ['sid']))
      .then(() => {
        this.remember(sid, row.expiresAt.getTime());
        callback?.();
      })
      .catch((error: unknown) => callback?.(error));
  }

  /**
   * Extends an unchanged session. Rolling sessions touch on every request, so the row is written
   * only when its expiry would move by more than a minute.
   */
  override touch(sid: string, data: session.SessionData, callback?: (err?: unknown) => void): void {
    if (this.anonymous.has(sid)) {
      this.keepAnonymous(sid, data);
      callback?.();
      return;
    }
    const expiresAt = this.rowExpiry(data);
    const known = this.storedExpiry.get(sid);
    if (known !== undefined && expiresAt.getTime() - known < 60_000) {
      callback?.();
      return;
    }
    const staleBefore = new Date(expiresAt.getTime() - 60_000);
    withWriteLock(this.dataSource, () => this.repository.update({ sid, expiresAt: LessThan(staleBefore) }, { expiresAt }))
      .then((result) => {
        if (result.affected) this.remember(sid, expiresAt.getTime());
        callback?.();
      })
      .catch((error: unknown) => callback?.(error));
  }

  override destroy(sid: string, callback?: (err?: unknown) => void): void {
    this.anonymous.delete(sid);
    this.storedExpiry.delete(sid);
    withWriteLock(this.dataSource, () => this.repository.delete({ sid }))
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error));
  }

  override clear(callback?: (err?: unknown) => void): void {
    this.anonymous.clear();
    this.storedExpiry.clear();
    withWriteLock(this.dataSource, () => this.repository.clear())
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error));
  }

  override length(callback: (err: unknown, length?: number) => void): void {
    this.repository
      .count()
      .then((count) => callback(null, count + this.anonymous.size))
      .catch((error: unknown) => callback(error));
  }

  /** Removes expired sessions; returns how many. */
  async prune(): Promise<number> {
    const result = await withWriteLock(this.dataSource, () => this.repository.delete({ expiresAt: LessThan(now()) }));
    return result.affected ?? 0;
  }

  close(): void {
    clearInterval(this.timer);
  }
}

/** A datetime as TypeORM stores it in SQLite (`2026-12-01 20:37:32.123`, UTC) → milliseconds. */
function storedDate(value: string | Date): number {
  if (value instanceof Date) return value.getTime();
  const iso = /^\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}(\.\d+)?$/.test(value) ? `${value.replace(' ', 'T')}Z` : value;
  return Date.parse(iso);
}
