import { type QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs, useNavigate, useParams } from 'react-router';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api-client';
import { meQueryOptions, useUser } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { Callout } from '@/components/callout';
import { DocumentTitle } from '@/components/document-title';
import { ErrorState } from '@/components/error-state';
import { LoadingState } from '@/components/loading-state';
import { tokenInfoQueryOptions, useTokenInfo } from '@/features/auth/api/get-token-info';
import { SetPasswordForm } from '@/features/auth/components/set-password-form';
import { AuthLayout } from '@/app/layouts/auth-layout';

export const loader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  // prefetchQuery never throws: a used or expired link (410) is shown by the page, not the error boundary.
  await Promise.all([queryClient.prefetchQuery(meQueryOptions()), queryClient.prefetchQuery(tokenInfoQueryOptions(params.token ?? ''))]);
  return null;
};

function LinkGone({ notFound }: { notFound: boolean }) {
  return (
    <AuthLayout title={notFound ? 'This link is not valid' : 'This link has been used or has expired'}>
      <DocumentTitle>Link used or expired</DocumentTitle>
      <div className="space-y-5 text-sm">
        <Callout tone="caution" title={notFound ? 'Link not recognised' : 'Link used or expired'}>
          <p>
            {notFound
              ? 'Check that the whole address from the e-mail was copied.'
              : 'Each link works once and only for a limited time, so that a forwarded or old e-mail cannot be used to take over an account.'}
          </p>
        </Callout>
        <ul className="list-disc space-y-1.5 pl-5 text-ink">
          <li>
            If you already chose a password, <Link to={paths.auth.signIn()} className="font-medium text-court-700 underline">sign in</Link>.
          </li>
          <li>
            To choose a new one, <Link to={paths.auth.forgotPassword()} className="font-medium text-court-700 underline">ask for a reset link</Link>.
          </li>
          <li>If you were invited and the invitation expired, ask your administrator to invite you again.</li>
        </ul>
      </div>
    </AuthLayout>
  );
}

/** The one-time link of an invitation or a password reset: choose a password, and you are in. */
export function Component() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const info = useTokenInfo(token);
  const { data: me } = useUser();
  const [gone, setGone] = useState(false);

  if (gone || (info.error instanceof ApiError && info.error.status === 410)) return <LinkGone notFound={false} />;
  if (info.error instanceof ApiError && info.error.status === 404) return <LinkGone notFound />;
  if (info.isPending) {
    return (
      <AuthLayout title="Checking your link">
        <LoadingState label="Checking your link…" />
      </AuthLayout>
    );
  }
  if (info.isError) {
    return (
      <AuthLayout title="This link could not be checked">
        <ErrorState error={info.error} onRetry={() => info.refetch()} retrying={info.isFetching} />
      </AuthLayout>
    );
  }

  const invitation = info.data.purpose === 'invitation';
  return (
    <AuthLayout
      title={invitation ? `Welcome to Scorecourt, ${info.data.name}` : 'Choose a new password'}
      subtitle={
        invitation
          ? 'You have been invited to Scorecourt. Choose a password to activate your account.'
          : `For ${info.data.email}. Your old password stops working once you save the new one.`
      }
    >
      <DocumentTitle>{invitation ? 'Accept your invitation' : 'Choose a new password'}</DocumentTitle>
      <div className="space-y-5">
        {me && me.email !== info.data.email ? (
          <Callout tone="info" title={`You are signed in as ${me.name}`}>
            <p>Saving this password signs you in as {info.data.email} instead.</p>
          </Callout>
        ) : null}
        <SetPasswordForm token={token} info={info.data} onDone={() => navigate(paths.home(), { replace: true })} onGone={() => setGone(true)} />
        <p className="text-xs text-ink-soft">This link works until {formatDateTime(info.data.expiresAt)}.</p>
      </div>
    </AuthLayout>
  );
}
