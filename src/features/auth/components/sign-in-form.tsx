import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router';
import { errorCodes } from '@shared/errors';
import { type User, loginInputSchema } from '@shared/users';
import { paths } from '@/config/paths';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useLogin } from '@/lib/auth';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { TextField } from '@/components/text-field';

function minutes(seconds: number): string {
  const value = Math.max(1, Math.ceil(seconds / 60));
  return value === 1 ? 'about a minute' : `about ${value} minutes`;
}

function SignInError({ error }: { error: unknown }) {
  if (error instanceof ApiError && (error.status === 429 || error.code === errorCodes.rateLimited)) {
    return (
      <Alert tone="caution" title="Sign-in is paused for now">
        <p>{error.message}</p>
        <p>
          {error.retryAfter
            ? `For your account’s safety, try again in ${minutes(error.retryAfter)}.`
            : 'For your account’s safety, wait a few minutes before trying again.'}{' '}
          If you have forgotten your password, <Link to={paths.auth.forgotPassword()}>ask for a reset link</Link>.
        </p>
      </Alert>
    );
  }
  if (error instanceof ApiError && error.status === 401) {
    return (
      <Alert tone="error" title="Sign-in failed">
        <p>{error.message}</p>
        <p>Check the e-mail address and password. Passwords are case-sensitive.</p>
      </Alert>
    );
  }
  return (
    <Alert tone="error" title="Sign-in failed">
      <p>{errorMessage(error)}</p>
    </Alert>
  );
}

/** E-mail and password; on success the person is in the cache and `onSignedIn` decides where to go. */
export function SignInForm({ onSignedIn }: { onSignedIn: (user: User) => void }) {
  const login = useLogin();
  const {
    register,
    handleSubmit,
    resetField,
    setFocus,
    formState: { errors },
  } = useForm({ resolver: zodResolver(loginInputSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit((values) =>
    login.mutate(values, {
      onSuccess: onSignedIn,
      onError: () => {
        resetField('password');
        setFocus('password');
      },
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {login.isError ? <SignInError error={login.error} /> : null}
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="username"
        inputMode="email"
        spellCheck={false}
        error={errors.email?.message}
        {...register('email')}
      />
      <div className="space-y-1.5">
        <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register('password')} />
        <p className="text-sm">
          <Link to={paths.auth.forgotPassword()} className="font-medium text-court-700 underline hover:text-court-900">
            Forgot your password?
          </Link>
        </p>
      </div>
      <Button type="submit" variant="primary" className="w-full" loading={login.isPending} loadingText="Signing in…">
        Sign in
      </Button>
    </form>
  );
}
