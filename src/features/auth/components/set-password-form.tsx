import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { type TokenInfo, type User, acceptTokenInputSchema } from '@shared/users';
import { ApiError, errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { TextField } from '@/components/text-field';
import { useAcceptToken } from '@/features/auth/api/accept-token';

const setPasswordSchema = acceptTokenInputSchema
  .extend({ confirm: z.string().min(1, 'Type the password again') })
  .refine((value) => value.password === value.confirm, { path: ['confirm'], message: 'The two passwords are not the same' });

/** Chooses a password with a one-time link (invitation or reset) and signs the person in. */
export function SetPasswordForm({
  token,
  info,
  onDone,
  onGone,
}: {
  token: string;
  info: TokenInfo;
  onDone: (user: User) => void;
  /** The link was used or expired while the form was open. */
  onGone: () => void;
}) {
  const accept = useAcceptToken(token);
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm({ resolver: zodResolver(setPasswordSchema), defaultValues: { password: '', confirm: '' } });

  const onSubmit = handleSubmit(({ password }) =>
    accept.mutate(
      { password },
      {
        onSuccess: onDone,
        onError: (error) => {
          if (error instanceof ApiError && error.status === 410) onGone();
        },
      },
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {accept.isError ? (
        <Alert tone="error" title="The password was not saved">
          <p>{errorMessage(accept.error)}</p>
        </Alert>
      ) : null}
      <TextField label="E-mail address" type="email" autoComplete="username" value={info.email} readOnly inputClassName="bg-paper-sunk" />
      <TextField
        label={info.purpose === 'invitation' ? 'Choose a password' : 'New password'}
        hint="At least 10 characters. A short sentence you will remember works well."
        type="password"
        autoComplete="new-password"
        error={errors.password?.message}
        {...register('password')}
      />
      <TextField label="Type it again" type="password" autoComplete="new-password" error={errors.confirm?.message} {...register('confirm')} />
      <Button type="submit" variant="primary" className="w-full" loading={accept.isPending} loadingText="Saving…">
        {info.purpose === 'invitation' ? 'Set password and sign in' : 'Save new password and sign in'}
      </Button>
    </form>
  );
}
