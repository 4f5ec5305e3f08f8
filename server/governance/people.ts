import type { User } from '../db/entities/index';

/** `{ id, name }` of a person, as the API names actors and authors. */
export function personRef(user: Pick<User, 'id' | 'name'>): { id: number; name: string } {
  return { id: user.id, name: user.name };
}

/** Dates in API bodies: ISO 8601 in UTC (shared/format.ts). */
export { iso } from '@shared/format';
