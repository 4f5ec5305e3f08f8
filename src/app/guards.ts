/**
 * Route guards, run in loaders before a page's data is fetched: signed-out people go to sign-in
 * with the page as their return path; people without the role get a 403 that the route's error
 * boundary turns into a refusal page naming the role (app/route-error.tsx).
 */
import { type QueryClient } from '@tanstack/react-query';
import { data, redirect } from 'react-router';
import { type Role } from '@shared/roles';
import { type User } from '@shared/users';
import { paths } from '@/config/paths';
import { hasRole, meQueryOptions } from '@/lib/auth';

/** The body of the 403 a role guard throws. */
export interface RoleRefusal {
  kind: 'role-refusal';
  /** Any one of these roles opens the page. */
  requiredRoles: Role[];
  /** The page, in words ("People"). */
  page: string;
}

export function isRoleRefusal(value: unknown): value is RoleRefusal {
  return typeof value === 'object' && value !== null && (value as { kind?: unknown }).kind === 'role-refusal';
}

export async function requireUser(queryClient: QueryClient, request: Request): Promise<User> {
  const user = await queryClient.ensureQueryData(meQueryOptions());
  if (!user) {
    const url = new URL(request.url);
    throw redirect(paths.auth.signIn({ next: `${url.pathname}${url.search}` }));
  }
  return user;
}

export async function requireRole(queryClient: QueryClient, request: Request, page: string, ...roles: Role[]): Promise<User> {
  const user = await requireUser(queryClient, request);
  if (!hasRole(user, ...roles)) {
    throw data({ kind: 'role-refusal', requiredRoles: roles, page } satisfies RoleRefusal, { status: 403 });
  }
  return user;
}
