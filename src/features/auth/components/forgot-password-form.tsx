import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { passwordResetRequestSchema } from '@shared/users';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { TextField } from '@/components/text-field';
import { useRequestPasswordReset } from '@/features/auth/api/request-password-reset';

/** Asks for a reset link. The answer is the same whether or not the address has an account. */
export function ForgotPasswordForm() {
  const reset = useRequestPasswordReset();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm({ resolver: zodResolver(passwordResetRequestSchema), defaultValues: { email: '' } });

  const onSubmit = handleSubmit((values) => reset.mutate(values, { onSuccess: () => setSentTo(values.email) }));

  if (sentTo) {
    return (
      <Alert tone="success" title="Check your e-mail">
        <p>
          If <strong className="font-semibold">{sentTo}</strong> belongs to a Scorecourt account, a link to choose a new password is on its
          way. The link works once and expires after a while.
        </p>
        <p>No e-mail after a few minutes? Check the address, or ask your administrator.</p>
      </Alert>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {reset.isError ? (
        <Alert tone="error" title="The request was not sent">
          <p>{errorMessage(reset.error)}</p>
        </Alert>
      ) : null}
      <TextField
        label="E-mail address"
        hint="The address you sign in with."
        type="email"
        autoComplete="username"
        inputMode="email"
        spellCheck={false}
        error={errors.email?.message}
        {...register('email')}
      />
      <Button type="submit" variant="primary" className="w-full" loading={reset.isPending} loadingText="Sending…">
        Send reset link
      </Button>
    </form>
  );
}
