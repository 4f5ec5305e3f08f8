import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type InviteInput, type User, userResponseSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** POST /api/users/invitations → 201 { user } (inactive until the link is used); 409 if the e-mail exists. */
export async function inviteUser(input: InviteInput): Promise<User> {
  return (await api.post('/api/users/invitations', input, { schema: userResponseSchema })).user;
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.users.all }),
  });
}
