import { Link, NavLink, Navigate, Outlet, ScrollRestoration, matchPath, useLocation, useNavigation } from 'react-router';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';
import { describeRoles, hasRole, useLogout, useUser } from '@/lib/auth';
import { Button } from '@/components/button';
import { ScorecourtMark } from '@/components/icons';
import { navigation } from '@/app/navigation';

/**
 * The frame of every signed-in page: the product name, the navigation of the person's roles, who
 * is signed in (name and roles) and sign-out. If the session ends while a page is open (a 401
 * anywhere clears the person), it goes to sign-in with this page as the return path.
 */
export function AppShell() {
  const { data: user } = useUser();
  const location = useLocation();
  const routerNavigation = useNavigation();
  const logout = useLogout();

  if (!user) {
    return <Navigate to={paths.auth.signIn({ next: `${location.pathname}${location.search}`, reason: 'expired' })} replace />;
  }

  const items = navigation.filter((item) => !item.roles || hasRole(user, ...item.roles));

  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only z-50 rounded-md bg-court-800 px-3 py-2 text-sm font-medium text-white focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header data-print="hide" className="relative border-b border-line bg-paper-raised">
        <div className="mx-auto flex min-h-14 max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2 sm:px-6">
          <Link
            to={paths.home()}
            className="flex items-center gap-2 text-base font-semibold tracking-tight text-court-900 focus-visible:outline-2 focus-visible:outline-offset-4 focus-visible:outline-court-500"
          >
            <ScorecourtMark className="size-7" />
            <span>Scorecourt</span>
          </Link>
          <nav aria-label="Main" className="order-last w-full sm:order-none sm:w-auto">
            <ul className="flex flex-wrap gap-1">
              {items.map((item) => {
                // Another entry is the current one here (e.g. New comparison under Comparisons).
                const excluded = !!item.except?.some((pattern) => matchPath(pattern, location.pathname));
                return (
                  <li key={item.to}>
                    <NavLink
                      to={item.to}
                      end={item.end}
                      aria-current={excluded ? false : 'page'}
                      className={({ isActive }) =>
                        cn(
                          'inline-flex h-9 items-center rounded-md px-3 text-sm font-medium',
                          'focus-visible:outline-2 focus-visible:outline-court-500',
                          isActive && !excluded
                            ? 'bg-court-50 text-court-800 ring-1 ring-court-200 ring-inset'
                            : 'text-ink-soft hover:bg-paper-sunk hover:text-ink',
                        )
                      }
                    >
                      {item.label}
                    </NavLink>
                  </li>
                );
              })}
            </ul>
          </nav>
          <div className="ml-auto flex items-center gap-4">
            <div className="text-right leading-tight" data-testid="signed-in-person">
              <p className="text-sm font-medium text-ink">{user.name}</p>
              <p className="text-xs text-ink-soft">
                <span className="sr-only">Roles: </span>
                {describeRoles(user.roles)}
              </p>
            </div>
            <Button size="sm" onClick={() => logout.mutate()} loading={logout.isPending} loadingText="Signing out…">
              Sign out
            </Button>
          </div>
        </div>
        {routerNavigation.state === 'loading' ? (
          <div className="absolute inset-x-0 -bottom-px h-0.5 overflow-hidden" role="status" aria-label="Loading the page">
            <div className="h-full w-1/3 animate-[progress-slide_1.2s_ease-in-out_infinite] bg-court-500 motion-reduce:w-full motion-reduce:animate-none" />
          </div>
        ) : null}
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-7xl flex-1 px-4 py-8 focus:outline-none sm:px-6">
        <Outlet />
      </main>
      <ScrollRestoration />
      <footer data-print="hide" className="border-t border-line">
        <p className="mx-auto max-w-7xl px-4 py-4 text-xs text-ink-soft sm:px-6">
          Scorecourt advises; your institution decides. Follow your model risk policy, local regulation and licensed advice.
        </p>
      </footer>
    </div>
  );
}
