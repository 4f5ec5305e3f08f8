import type { Role } from '@shared/roles';
import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import { guard } from '../auth/guards';
import { validate } from './validate';

/**
 * The route registry. Every API route is declared once with `defineRoute`, with its access rule
 * beside it, and mounted by `mountRoutes`; nothing calls `router.get/post/…` directly. Tests read
 * the same table (`app.locals.routes`) to generate the role matrix, so no route is missed.
 */

/** Who may call a route: anyone, anyone signed in, or anyone holding one of these roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

type Output<S, Fallback> = S extends z.ZodType ? z.output<S> : Fallback;

export type ValidatedRequest<B, P, Q> = Request<Output<P, Request['params']>, unknown, Output<B, unknown>, Output<Q, Request['query']>>;

/** Any request, whatever its validated shapes: for helpers that handlers pass `req` to. */
export type AnyRequest = Request<unknown, unknown, unknown, unknown>;

export interface RouteSpec<B extends z.ZodType | undefined, P extends z.ZodType | undefined, Q extends z.ZodType | undefined> {
  method: Method;
  /** Path below /api, in Express 5 syntax: `/users/:id`. */
  path: string;
  access: Access;
  /** One line for the developers' route table. */
  summary: string;
  validate?: { body?: B; params?: P; query?: Q };
  /** Extra middleware run after the guard and validation, before the handler (e.g. a rate limit). */
  before?: RequestHandler[];
  /**
   * The handler. A returned value (other than undefined) is sent as JSON with the status set on
   * `res` (200 by default); return nothing when the handler answered itself.
   */
  handler: (req: ValidatedRequest<B, P, Q>, res: Response, next: NextFunction) => unknown;
}

/** A route as the registry keeps it. */
export interface RouteDefinition {
  method: Method;
  path: string;
  access: Access;
  summary: string;
  schemas: { body?: z.ZodType; params?: z.ZodType; query?: z.ZodType };
  before: RequestHandler[];
  handler: (req: Request, res: Response, next: NextFunction) => unknown;
}

export function defineRoute<
  B extends z.ZodType | undefined = undefined,
  P extends z.ZodType | undefined = undefined,
  Q extends z.ZodType | undefined = undefined,
>(spec: RouteSpec<B, P, Q>): RouteDefinition {
  if (!spec.path.startsWith('/')) throw new Error(`route path must start with "/": ${spec.path}`);
  if (Array.isArray(spec.access) && spec.access.length === 0) throw new Error(`route ${spec.path}: an empty role list lets no one in`);
  return {
    method: spec.method,
    path: spec.path,
    access: spec.access,
    summary: spec.summary,
    schemas: { body: spec.validate?.body, params: spec.validate?.params, query: spec.validate?.query },
    before: spec.before ?? [],
    handler: spec.handler as RouteDefinition['handler'],
  };
}

function send(handler: RouteDefinition['handler']): RequestHandler {
  return async (req, res, next) => {
    const result = await handler(req, res, next);
    if (result !== undefined && !res.headersSent) res.json(result);
  };
}

/** Mounts every route on `router` as guard → write limit (changes only) → validation → extra middleware → handler. */
export function mountRoutes(router: Router, routes: readonly RouteDefinition[], options: { writeLimit?: RequestHandler } = {}): void {
  const seen = new Set<string>();
  for (const route of routes) {
    const key = `${route.method.toUpperCase()} ${route.path}`;
    if (seen.has(key)) throw new Error(`route declared twice: ${key}`);
    seen.add(key);
    // Changes count against the person's budget (write-limits.ts), after the guard has found who it is.
    const limit = route.method !== 'get' && options.writeLimit ? [options.writeLimit] : [];
    router[route.method](route.path, ...guard(route.access), ...limit, validate(route.schemas), ...route.before, send(route.handler));
  }
}

/** `admin`, `signed-in`, `public` or `analyst | committee`, for tables and messages. */
export function describeAccess(access: Access): string {
  return typeof access === 'string' ? access : access.join(' | ');
}
