import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** The query key of the signed-in person (lib/auth.ts); a 401 anywhere clears it. */
export const meQueryKey = queryKeys.auth.me;

function isClientError(error: unknown): boolean {
  return error instanceof ApiError && error.status >= 400 && error.status < 500;
}

/**
 * One QueryClient for the app. Requests the server refused (4xx) are not retried; network and
 * server errors are retried twice. A 401 on any request means the session ended (signed out
 * elsewhere, deactivated, expired): the person is cleared, and the app shell sends them to sign-in.
 */
export function createQueryClient(): QueryClient {
  const onError = (error: unknown) => {
    if (error instanceof ApiError && error.status === 401) {
      queryClient.setQueryData(meQueryKey, null);
    }
  };
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError }),
    mutationCache: new MutationCache({ onError }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: false,
        retry: (failureCount, error) => !isClientError(error) && failureCount < 2,
      },
      mutations: { retry: false },
    },
  });
  return queryClient;
}

export const queryClient = createQueryClient();
