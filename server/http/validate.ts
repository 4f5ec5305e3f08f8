import { errorCodes } from '@shared/errors';
import type { RequestHandler } from 'express';
import { z } from 'zod';
import { AppError } from '../errors';

/**
 * Parses body, params and query with the route's zod schemas and *replaces* them with the parsed
 * values, so handlers read typed, trimmed, defaulted input and never parse again. Express 5's
 * `req.query` is a getter, so it is redefined on the request object.
 */
export function validate(schemas: { body?: z.ZodType; params?: z.ZodType; query?: z.ZodType }): RequestHandler {
  return (req, _res, next) => {
    const problems: { location: string; path: string; message: string }[] = [];
    const parse = (location: 'body' | 'params' | 'query', schema: z.ZodType | undefined, value: unknown) => {
      if (!schema) return value;
      const result = schema.safeParse(value ?? (location === 'body' ? {} : value));
      if (result.success) return result.data;
      for (const issue of result.error.issues) {
        problems.push({ location, path: issue.path.map(String).join('.'), message: issue.message });
      }
      return value;
    };
    const body = parse('body', schemas.body, req.body);
    const params = parse('params', schemas.params, req.params);
    const query = parse('query', schemas.query, req.query);
    if (problems.length > 0) {
      const first = problems[0];
      const where = first.path ? `${first.path}: ` : '';
      next(new AppError(errorCodes.validation, `${where}${first.message}`, 400, { issues: problems }));
      return;
    }
    if (schemas.body) req.body = body;
    if (schemas.params) req.params = params as typeof req.params;
    if (schemas.query) Object.defineProperty(req, 'query', { value: query, writable: true, configurable: true, enumerable: true });
    next();
  };
}

/** `/:id` route parameters: a positive whole number. */
export const idParams = z.object({ id: z.coerce.number().int().positive() });
