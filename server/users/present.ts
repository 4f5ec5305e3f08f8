import { roles as allRoles, type Role } from '@shared/roles';
import type { User as UserBody } from '@shared/users';
import type { User } from '../db/entities/index';

/** A person as the API shows them: never the password hash. */
export function presentUser(user: User): UserBody {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    roles: user.roles,
    active: user.active,
    createdAt: user.createdAt.toISOString(),
  };
}

/** `{ id, name }` of a person, as the API names actors and authors. */
export function personRef(user: Pick<User, 'id' | 'name'>): { id: number; name: string } {
  return { id: user.id, name: user.name };
}

/** Roles without repeats, in the order of shared/roles.ts. */
export function normaliseRoles(roles: readonly Role[]): Role[] {
  return allRoles.filter((role) => roles.includes(role));
}
