import { errorCodes } from '@shared/errors';
import type { RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit, type Store } from 'express-rate-limit';
import type { DataSource } from 'typeorm';
import { isPostgres } from '../db/driver';
import { AppError } from '../errors';
import { DatabaseRateLimitStore } from './rate-limit-store';

/** The key for per-account, per-address limits: the e-mail (already normalised) and the client address. */
function accountAndAddress(req: Parameters<RequestHandler>[0]): string {
  const email = typeof (req.body as { email?: unknown } | undefined)?.email === 'string' ? (req.body as { email: string }).email : '';
  return `${email}|${ipKeyGenerator(req.ip ?? 'unknown')}`;
}

function limited(message: string): RequestHandler {
  return (req, _res, next) => {
    const reset = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
    const retryAfterSeconds = reset ? Math.max(1, Math.ceil((reset.getTime() - Date.now()) / 1000)) : undefined;
    const minutes = retryAfterSeconds ? Math.ceil(retryAfterSeconds / 60) : 15;
    next(new AppError(errorCodes.rateLimited, `${message} Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, 429, { retryAfterSeconds }));
  };
}

/**
 * Sign-in: 10 failed attempts in 15 minutes for one account from one address → 429 until the
 * window passes. Successful sign-ins are not counted. Each app gets its own counters: in memory
 * on SQLite (the server is one process), in the database on PostgreSQL (every instance counts the
 * same attempts: rate-limit-store.ts).
 */
export function signInLimiter(dataSource?: DataSource): RequestHandler {
  const onLimit = limited('Too many failed sign-in attempts for this account.');
  return rateLimit({
    windowMs: 15 * 60_000,
    limit: 10,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: accountAndAddress,
    handler: (req, res, next) => onLimit(req, res, next),
    store: sharedStore(dataSource, 'sign-in:'),
  });
}

/** The counters' store: in the database on PostgreSQL, else express-rate-limit's memory store. */
export function sharedStore(dataSource: DataSource | undefined, prefix: string): Store | undefined {
  return dataSource && isPostgres(dataSource) ? new DatabaseRateLimitStore(dataSource, prefix) : undefined;
}

/** Password-reset requests: 5 in 15 minutes for one address and account, so the form cannot flood an inbox. */
export function resetRequestLimiter(dataSource?: DataSource): RequestHandler {
  const onLimit = limited('Too many password-reset requests.');
  return rateLimit({
    windowMs: 15 * 60_000,
    limit: 5,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: accountAndAddress,
    handler: (req, res, next) => onLimit(req, res, next),
    store: sharedStore(dataSource, 'password-reset:'),
  });
}
