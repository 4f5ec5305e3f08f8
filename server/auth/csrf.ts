import { errorCodes } from '@shared/errors';
import { csrfSync } from 'csrf-sync';
import type { Request, RequestHandler, Response } from 'express';
import { AppError } from '../errors';

/**
 * CSRF protection with the synchroniser-token pattern (csrf-sync): the token lives in the session
 * and every POST, PUT, PATCH and DELETE — sign-in included — must send it back in the
 * `X-CSRF-Token` header. `GET /api/auth/csrf` hands it out. Signing in or out starts a new
 * session with a new token, which the response carries in the same header.
 */
export const csrfHeader = 'X-CSRF-Token';

const { generateToken, isRequestValid } = csrfSync({
  getTokenFromRequest: (req) => {
    const value = req.headers[csrfHeader.toLowerCase()];
    return Array.isArray(value) ? value[0] : value;
  },
});

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (safeMethods.has(req.method) || isRequestValid(req)) return next();
  next(new AppError(errorCodes.csrf, 'The security token is missing or out of date. Reload the page and try again.', 403));
};

/** The session's token, created on first use. */
export function csrfToken(req: Request): string {
  return generateToken(req);
}

/** A fresh token for a new session, also sent back in the response header. */
export function renewCsrfToken(req: Request, res: Response): string {
  const token = generateToken(req, true);
  res.setHeader(csrfHeader, token);
  return token;
}
