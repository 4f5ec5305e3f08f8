import { type QueryClient } from '@tanstack/react-query';
import { type ComponentType, Suspense } from 'react';
import { type LoaderFunction, type RouteObject, createBrowserRouter } from 'react-router';
import { paths } from '@/config/paths';
import { LoadingState } from '@/components/loading-state';
import { requireUser } from '@/app/guards';
import { AppShell } from '@/app/layouts/app-shell';
import { RootErrorBoundary, RouteErrorBoundary } from '@/app/route-error';
import { comparisonTabs } from '@/app/routes/comparisons/tabs';

/**
 * A route module in app/routes exports `Component` and, when the page needs data or a guard,
 * `loader(queryClient)`: a loader factory that fills the query cache (`ensureQueryData`) so the
 * component reads it with `useSuspenseQuery`, without loading or error states of its own. Modules
 * load lazily: each page is its own chunk.
 */
interface RouteModule {
  Component: ComponentType;
  loader?: (queryClient: QueryClient) => LoaderFunction;
}

function page(queryClient: QueryClient, load: () => Promise<RouteModule>): Pick<RouteObject, 'lazy'> {
  return {
    lazy: async () => {
      const module = await load();
      return { Component: module.Component, ...(module.loader ? { loader: module.loader(queryClient) } : {}) };
    },
  };
}

/**
 * A page inside the app shell, with its own error boundary: a failed loader or query of the page
 * (a comparison's tab, say) shows there, while the shell and the enclosing pages (the comparison's
 * header and tabs) stay. A query the loader did not fill (the cache was cleared meanwhile)
 * suspends into a loading state here rather than blanking the shell.
 */
function shellPage(queryClient: QueryClient, load: () => Promise<RouteModule>): Pick<RouteObject, 'lazy' | 'ErrorBoundary'> {
  return {
    ErrorBoundary: RouteErrorBoundary,
    lazy: async () => {
      const module = await load();
      const Page = module.Component;
      return {
        Component: () => (
          <Suspense fallback={<LoadingState label="Loading…" variant="skeleton" />}>
            <Page />
          </Suspense>
        ),
        ...(module.loader ? { loader: module.loader(queryClient) } : {}),
      };
    },
  };
}

function HydrateFallback() {
  return (
    <div className="flex min-h-screen items-center justify-center">
      <LoadingState label="Loading Scorecourt…" />
    </div>
  );
}

export function createRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      id: 'root',
      ErrorBoundary: RootErrorBoundary,
      HydrateFallback,
      children: [
        { path: paths.auth.signIn.pattern, ...page(queryClient, () => import('@/app/routes/auth/sign-in')) },
        { path: paths.auth.forgotPassword.pattern, ...page(queryClient, () => import('@/app/routes/auth/forgot-password')) },
        { path: paths.auth.accept.pattern, ...page(queryClient, () => import('@/app/routes/auth/accept')) },
        {
          id: 'app',
          // Every page inside the shell needs a signed-in person; pages add their role guards.
          loader: async ({ request }) => {
            await requireUser(queryClient, request);
            return null;
          },
          Component: AppShell,
          children: [
            {
              // Errors of a page render inside the shell, so navigation stays available; each page
              // also has its own boundary (shellPage), so a tab's error keeps the comparison's frame.
              ErrorBoundary: RouteErrorBoundary,
              children: [
                { index: true, ...shellPage(queryClient, () => import('@/app/routes/home')) },
                { path: paths.comparisons.list.pattern, ...shellPage(queryClient, () => import('@/app/routes/comparisons/list')) },
                { path: paths.comparisons.new.pattern, ...shellPage(queryClient, () => import('@/app/routes/comparisons/new')) },
                { path: paths.comparisons.setup.pattern, ...shellPage(queryClient, () => import('@/app/routes/comparisons/setup')) },
                {
                  // The comparison shell (header, next step, tabs); each tab is a child route (tabs.ts).
                  path: paths.comparisons.detail.pattern,
                  ...shellPage(queryClient, () => import('@/app/routes/comparisons/layout')),
                  children: comparisonTabs.map((tab) =>
                    tab.path === paths.comparisons.detail
                      ? { index: true, ...shellPage(queryClient, tab.load) }
                      : { path: tab.path.pattern, ...shellPage(queryClient, tab.load) },
                  ),
                },
                { path: paths.admin.people.pattern, ...shellPage(queryClient, () => import('@/app/routes/admin/people')) },
                { path: paths.admin.outbox.pattern, ...shellPage(queryClient, () => import('@/app/routes/admin/outbox')) },
                { path: paths.admin.policy.pattern, ...shellPage(queryClient, () => import('@/app/routes/admin/policy')) },
                ...(import.meta.env.DEV
                  ? [{ path: paths.dev.components.pattern, ...shellPage(queryClient, () => import('@/app/routes/dev/components')) }]
                  : []),
                { path: '*', ...page(queryClient, () => import('@/app/routes/not-found')) },
              ],
            },
          ],
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
