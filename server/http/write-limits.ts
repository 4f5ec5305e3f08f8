import { errorCodes } from '@shared/errors';
import type { RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { DataSource } from 'typeorm';
import { sharedStore } from '../auth/rate-limits';
import { AppError } from '../errors';

/**
 * One budget of changes per person: every POST, PUT, PATCH and DELETE of the API counts against
 * the signed-in person's budget (WRITES_PER_MINUTE, 120 by default), or against the client
 * address when no one is signed in; over it → 429 with Retry-After, in the one error shape. So no
 * single account can fill the database (41,000 notes at 250 a second before) or the mail queue.
 * Sign-in and password-reset requests keep their own, stricter limits (auth/rate-limits.ts).
 * Counters are in memory on SQLite (the server is one process), in the database on PostgreSQL
 * (several instances behind a load balancer share one budget per person: auth/rate-limit-store.ts).
 */
export function writeLimiter(perMinute: number, dataSource?: DataSource): RequestHandler {
  return rateLimit({
    store: sharedStore(dataSource, 'writes:'),
    windowMs: 60_000,
    limit: perMinute,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skip: (req) => req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS',
    keyGenerator: (req) => (req.user ? `person:${req.user.id}` : `address:${ipKeyGenerator(req.ip ?? 'unknown')}`),
    handler: (req, res, next) => {
      const reset = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
      const retryAfterSeconds = reset ? Math.max(1, Math.ceil((reset.getTime() - Date.now()) / 1000)) : 60;
      res.setHeader('Retry-After', String(retryAfterSeconds));
      next(
        new AppError(errorCodes.rateLimited, `Too many changes in a minute (at most ${perMinute}). Try again in ${retryAfterSeconds} seconds.`, 429, {
          retryAfterSeconds,
        }),
      );
    },
  });
}
