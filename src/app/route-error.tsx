import { isRouteErrorResponse, useRevalidator, useRouteError } from 'react-router';
import { type Role } from '@shared/roles';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api-client';
import { describeRoles, useUser } from '@/lib/auth';
import { Button, ButtonLink } from '@/components/button';
import { Callout } from '@/components/callout';
import { DocumentTitle } from '@/components/document-title';
import { ErrorState } from '@/components/error-state';
import { PageHeader } from '@/components/page-header';
import { isRoleRefusal } from '@/app/guards';

/** A page the person's roles do not open: which role it needs, who they are, what to do. */
export function RefusalPage({ page, requiredRoles, message }: { page?: string; requiredRoles?: Role[]; message?: string }) {
  const { data: user } = useUser();
  return (
    <div className="max-w-2xl">
      <DocumentTitle>Not available to you</DocumentTitle>
      <PageHeader eyebrow="Access" title={page ? `${page} needs another role` : 'This is not available to you'} />
      <Callout tone="caution" title={requiredRoles ? `Needs the ${describeRoles(requiredRoles, 'or')} role` : 'Permission needed'}>
        {requiredRoles ? (
          <p>
            {page ?? 'This page'} is open to people with the {describeRoles(requiredRoles, 'or')} role.
          </p>
        ) : (
          <p>{message ?? 'Your roles do not allow this.'}</p>
        )}
        {user ? (
          <p>
            You are signed in as {user.name} ({user.email}) with the {describeRoles(user.roles)} {user.roles.length === 1 ? 'role' : 'roles'}.
          </p>
        ) : null}
        <p>If your work needs it, ask an administrator to add the role to your account.</p>
      </Callout>
      <div className="mt-6">
        <ButtonLink to={paths.home()} variant="secondary">
          Go to your home page
        </ButtonLink>
      </div>
    </div>
  );
}

export function NotFoundPage() {
  return (
    <div className="max-w-2xl">
      <DocumentTitle>Page not found</DocumentTitle>
      <PageHeader eyebrow="404" title="Page not found" subtitle="There is no page at this address. It may have moved, or the link may be mistyped." />
      <ButtonLink to={paths.home()} variant="primary">
        Go to your home page
      </ButtonLink>
    </div>
  );
}

function statusOf(error: unknown): number | null {
  if (isRouteErrorResponse(error)) return error.status;
  if (error instanceof ApiError) return error.status;
  return null;
}

/** Inside the app shell: loader and render errors of a page, with the shell still around them. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  const revalidator = useRevalidator();
  if (isRouteErrorResponse(error) && isRoleRefusal(error.data)) {
    return <RefusalPage page={error.data.page} requiredRoles={error.data.requiredRoles} />;
  }
  const status = statusOf(error);
  if (status === 403) return <RefusalPage message={error instanceof ApiError ? error.message : undefined} />;
  if (status === 404) return <NotFoundPage />;
  return (
    <div className="max-w-2xl">
      <DocumentTitle>Something went wrong</DocumentTitle>
      <PageHeader title="This page could not be shown" />
      <ErrorState
        title="Something went wrong"
        error={error instanceof Error || error instanceof ApiError ? error : new Error('The page failed to load.')}
        onRetry={() => revalidator.revalidate()}
        retrying={revalidator.state === 'loading'}
      />
    </div>
  );
}

/** Outside the shell (signed-out pages, or the shell itself failed): a full-page error. */
export function RootErrorBoundary() {
  const error = useRouteError();
  if (import.meta.env.DEV) console.error(error);
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <DocumentTitle>Something went wrong</DocumentTitle>
      <PageHeader title="Scorecourt could not start this page" />
      <ErrorState error={error instanceof Error ? error : new Error('An unexpected error occurred.')}>
        <p>Reload the page to try again. If it keeps happening, the server may be down.</p>
      </ErrorState>
      <div className="mt-6">
        <Button variant="primary" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
      </div>
    </main>
  );
}
