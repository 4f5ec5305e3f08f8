import { queryOptions } from '@tanstack/react-query';
import { type User, usersResponseSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/users → { users } (admin). */
export async function getUsers(): Promise<User[]> {
  return (await api.get('/api/users', { schema: usersResponseSchema })).users;
}

export const usersQueryOptions = () => queryOptions({ queryKey: queryKeys.users.list(), queryFn: getUsers });
