import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type User, type acceptTokenInputSchema, userResponseSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { useSignedIn } from '@/lib/auth';
import { queryKeys } from '@/lib/query-keys';

export type AcceptTokenInput = z.input<typeof acceptTokenInputSchema>;

/** POST /api/auth/tokens/:token/accept → { user }: sets the password and signs the person in. */
export async function acceptToken(token: string, input: AcceptTokenInput): Promise<User> {
  return (await api.post(`/api/auth/tokens/${encodeURIComponent(token)}/accept`, input, { schema: userResponseSchema })).user;
}

export function useAcceptToken(token: string) {
  const queryClient = useQueryClient();
  const signedIn = useSignedIn();
  return useMutation({
    mutationFn: (input: AcceptTokenInput) => acceptToken(token, input),
    onSuccess: (user) => {
      signedIn(user);
      // The link is spent: mark what it said as stale for the next visit, without refetching now
      // (a refetch would answer 410 and flash "link used" before the page moves on).
      void queryClient.invalidateQueries({ queryKey: queryKeys.auth.token(token), refetchType: 'none' });
    },
  });
}
