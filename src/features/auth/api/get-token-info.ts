import { queryOptions, useQuery } from '@tanstack/react-query';
import { type TokenInfo, tokenInfoSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/auth/tokens/:token → what a one-time link is for; 410 when used or expired. */
export async function getTokenInfo(token: string): Promise<TokenInfo> {
  return api.get(`/api/auth/tokens/${encodeURIComponent(token)}`, { schema: tokenInfoSchema });
}

export const tokenInfoQueryOptions = (token: string) =>
  queryOptions({
    queryKey: queryKeys.auth.token(token),
    queryFn: () => getTokenInfo(token),
    // A link's answer does not change while the page is open; a 410 is an answer, not a glitch.
    staleTime: Infinity,
    retryOnMount: false,
  });

export function useTokenInfo(token: string) {
  return useQuery(tokenInfoQueryOptions(token));
}
