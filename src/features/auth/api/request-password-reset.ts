import { useMutation } from '@tanstack/react-query';
import { type z } from 'zod';
import { type passwordResetRequestSchema } from '@shared/users';
import { api } from '@/lib/api-client';

export type PasswordResetRequest = z.input<typeof passwordResetRequestSchema>;

/** POST /api/auth/password-reset → 202 { ok: true }, whether or not the address is known. */
export async function requestPasswordReset(input: PasswordResetRequest): Promise<void> {
  await api.post('/api/auth/password-reset', input);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
