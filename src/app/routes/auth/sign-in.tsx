import { type QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, redirect, useNavigate, useSearchParams } from 'react-router';
import { paths, safeReturnPath } from '@/config/paths';
import { meQueryOptions } from '@/lib/auth';
import { Callout } from '@/components/callout';
import { DocumentTitle } from '@/components/document-title';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { AuthLayout } from '@/app/layouts/auth-layout';

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const user = await queryClient.ensureQueryData(meQueryOptions());
  if (user) throw redirect(safeReturnPath(new URL(request.url).searchParams.get('next')) ?? paths.home());
  return null;
};

export function Component() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = safeReturnPath(params.get('next'));
  const reason = params.get('reason');
  return (
    <AuthLayout title="Sign in" subtitle="Use the e-mail address your administrator invited.">
      <DocumentTitle>Sign in</DocumentTitle>
      <div className="space-y-5">
        {reason === 'signed-out' ? (
          <Callout tone="success" title="You have signed out">
            <p>Sign in again to continue.</p>
          </Callout>
        ) : reason === 'expired' ? (
          <Callout tone="info" title="Your session has ended">
            <p>Sign in again to continue where you were.</p>
          </Callout>
        ) : null}
        <SignInForm onSignedIn={() => navigate(next ?? paths.home(), { replace: true })} />
      </div>
    </AuthLayout>
  );
}
