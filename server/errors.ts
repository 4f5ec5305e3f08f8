import { errorCodes, type ApiErrorBody } from '@shared/errors';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { storageFailureKind, type StorageFailureKind } from './db/storage-errors';
import type { Logger } from './log';

/**
 * The one error type of the server. Throw it (or pass it to next) anywhere; the error middleware
 * turns it into `{ error: { code, message, details? } }` with its status. Anything else that
 * reaches the middleware is a bug: it is logged with its stack and the client gets a plain 500.
 */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status: number,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (message = 'Not found') => new AppError(errorCodes.notFound, message, 404);
export const conflict = (message: string, details?: unknown) => new AppError(errorCodes.conflict, message, 409, details);
export const unauthenticated = () => new AppError(errorCodes.unauthenticated, 'Sign in to continue.', 401);
export const forbidden = (message = 'Your role does not allow this.') => new AppError(errorCodes.forbidden, message, 403);

/** A storage failure (db/storage-errors.ts) as the API answers it: 507 when full, 503 otherwise. */
export function storageError(kind: StorageFailureKind): AppError {
  return kind === 'full'
    ? new AppError(
        errorCodes.storageFull,
        'The server has no room left to store this. Nothing of it was kept; ask the administrator to free disk space, then try again.',
        507,
      )
    : new AppError(
        errorCodes.storageUnavailable,
        'The server could not write to its storage. Nothing of this request was kept; try again later, and tell the administrator if it persists.',
        503,
      );
}

function body(code: string, message: string, details?: unknown): ApiErrorBody {
  return details === undefined ? { error: { code, message } } : { error: { code, message, details } };
}

/** Errors raised by libraries before our handlers run, mapped to the API's own words. */
function fromLibrary(err: unknown): AppError | null {
  if (typeof err !== 'object' || err === null) return null;
  // SQLite or the file system refused a write (disk full, I/O error): the server's fault, not the client's
  const storage = storageFailureKind(err);
  if (storage !== null) return storageError(storage);
  const e = err as { type?: unknown; name?: unknown; code?: unknown; status?: unknown; expose?: unknown; message?: unknown };
  // body-parser
  if (e.type === 'entity.parse.failed') return new AppError(errorCodes.badInput, 'The request body is not valid JSON.', 400);
  if (e.type === 'entity.too.large') return new AppError(errorCodes.tooLarge, 'The request body is too large.', 413);
  if (e.type === 'encoding.unsupported' || e.type === 'charset.unsupported') {
    return new AppError(errorCodes.badInput, 'The request body uses an unsupported encoding.', 415);
  }
  // multer (uploads)
  if (e.name === 'MulterError') {
    if (e.code === 'LIMIT_FILE_SIZE') return new AppError(errorCodes.tooLarge, 'The file is larger than the upload limit.', 413);
    return new AppError(errorCodes.badInput, `The upload was refused (${String(e.code)}).`, 400);
  }
  // the router, when a path parameter's percent-encoding is malformed (`/comparisons/%E0%A4%A`)
  if (err instanceof URIError && e.status === 400) {
    return new AppError(errorCodes.badInput, 'The address holds a malformed percent-encoding (a "%" not followed by two hexadecimal digits of UTF-8).', 400);
  }
  // http-errors with a client status and a message meant for the client
  if (typeof e.status === 'number' && e.status >= 400 && e.status < 500 && e.expose === true && typeof e.message === 'string') {
    return new AppError(errorCodes.badInput, e.message, e.status);
  }
  return null;
}

export function errorMiddleware(log: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    if (res.headersSent) {
      next(err);
      return;
    }
    const known = err instanceof AppError ? err : fromLibrary(err);
    if (known) {
      if (known.status >= 500) log.error(`${req.method} ${req.originalUrl} → ${known.status} ${known.code}`, err);
      res.status(known.status).json(body(known.code, known.message, known.details));
      return;
    }
    const requestId = res.getHeader('X-Request-Id');
    log.error(`${req.method} ${req.originalUrl} → 500 (request ${String(requestId)})`, err);
    res
      .status(500)
      .json(body(errorCodes.internal, 'Something went wrong on our side. It has been logged; please try again.', { requestId }));
  };
}

/** Unknown /api routes answer JSON, never the client's HTML. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  const path = req.originalUrl.split('?')[0];
  // The path is the client's: shown shortened, so a long address does not come back whole.
  next(notFound(`There is no API route ${req.method} ${path.length > 120 ? `${path.slice(0, 117)}…` : path}.`));
};
