import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type UpdateUserInput, type User, userResponseSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { meQueryKey } from '@/lib/auth';
import { queryKeys } from '@/lib/query-keys';

/** PATCH /api/users/:id → { user }: name, roles or active. Deactivating ends the person's sessions. */
export async function updateUser(id: number, input: UpdateUserInput): Promise<User> {
  return (await api.patch(`/api/users/${id}`, input, { schema: userResponseSchema })).user;
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: UpdateUserInput }) => updateUser(id, input),
    onSuccess: async (user) => {
      await queryClient.invalidateQueries({ queryKey: queryKeys.users.all });
      // An administrator may change their own roles: the navigation follows.
      const me = queryClient.getQueryData<User | null>(meQueryKey);
      if (me && me.id === user.id) queryClient.setQueryData(meQueryKey, user);
    },
  });
}
