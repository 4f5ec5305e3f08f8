/**
 * Who is signed in, and the sign-in and sign-out calls. The current person lives in the query
 * cache under ['auth', 'me'] as `User` or `null` (signed out); route loaders fill it and guard
 * pages with it (app/guards.ts), components read it with `useUser()`.
 */
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { type Role, roleLabels } from '@shared/roles';
import { type LoginInput, type User, userResponseSchema } from '@shared/users';
import { paths } from '@/config/paths';
import { api, isApiError, resetCsrfToken } from '@/lib/api-client';
import { meQueryKey } from '@/lib/query-client';

export { meQueryKey };

/** GET /api/auth/me → the person, or null when nobody is signed in (401). */
export async function getMe(): Promise<User | null> {
  try {
    return (await api.get('/api/auth/me', { schema: userResponseSchema })).user;
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const meQueryOptions = () =>
  queryOptions({ queryKey: meQueryKey, queryFn: getMe, staleTime: 5 * 60_000 });

/** The signed-in person (`data` is null when signed out). */
export function useUser() {
  return useQuery(meQueryOptions());
}

/** POST /api/auth/login → { user }; 401 wrong e-mail or password, 429 too many attempts. */
export async function login(input: LoginInput): Promise<User> {
  return (await api.post('/api/auth/login', input, { schema: userResponseSchema })).user;
}

/** POST /api/auth/logout. */
export async function logout(): Promise<void> {
  await api.post('/api/auth/logout');
}

/** Starts a session for `user`: the server regenerated the session, so the CSRF token is new. */
export function useSignedIn() {
  const queryClient = useQueryClient();
  return (user: User) => {
    resetCsrfToken();
    queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== meQueryKey[0] });
    queryClient.setQueryData(meQueryKey, user);
  };
}

export function useLogin() {
  const signedIn = useSignedIn();
  return useMutation({ mutationFn: login, onSuccess: signedIn });
}

/**
 * Signs out, then loads the sign-in page afresh (a full page load, not a client-side navigation),
 * so nothing of this person's data stays in memory on a shared computer. This happens even when
 * the server could not be reached: the person asked to leave.
 */
export function useLogout() {
  return useMutation({
    mutationFn: logout,
    onSettled: () => {
      resetCsrfToken();
      window.location.assign(paths.auth.signIn({ reason: 'signed-out' }));
    },
  });
}

// --- roles --------------------------------------------------------------------------------

/** True when the person holds at least one of `roles` (any-of). */
export function hasRole(user: Pick<User, 'roles'> | null | undefined, ...roles: Role[]): boolean {
  if (!user) return false;
  return roles.some((role) => user.roles.includes(role));
}

/** "Administrator", "Modeler or Analyst (validation)". */
export function describeRoles(roles: readonly Role[], joiner: 'and' | 'or' = 'and'): string {
  const labels = roles.map((role) => roleLabels[role]);
  if (labels.length <= 1) return labels[0] ?? '';
  return `${labels.slice(0, -1).join(', ')} ${joiner} ${labels[labels.length - 1]}`;
}
