import type { Role } from '@shared/roles';
import type { RequestHandler } from 'express';
import { forbidden, unauthenticated } from '../errors';
import type { Access } from '../http/routes';
import './session-user';

/** Not signed in → 401. */
export const requireSignedIn: RequestHandler = (req, _res, next) => {
  next(req.user ? undefined : unauthenticated());
};

/** Not signed in → 401; signed in without any of `roles` → 403. */
export function requireRole(...roles: Role[]): RequestHandler {
  if (roles.length === 0) throw new Error('requireRole needs at least one role');
  return (req, _res, next) => {
    if (!req.user) return next(unauthenticated());
    if (!req.user.roles.some((role) => roles.includes(role))) {
      return next(forbidden(`This needs the ${roles.join(' or ')} role.`));
    }
    next();
  };
}

/** The middleware for a route's access rule (none for public routes). */
export function guard(access: Access): RequestHandler[] {
  if (access === 'public') return [];
  if (access === 'signed-in') return [requireSignedIn];
  return [requireRole(...access)];
}

/** The signed-in person of a guarded route's request (401 if, against expectation, there is none). */
export function currentUser(req: Express.Request): Express.User {
  if (!req.user) throw unauthenticated();
  return req.user;
}
