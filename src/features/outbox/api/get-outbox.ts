import { queryOptions } from '@tanstack/react-query';
import { outboxResponseSchema } from '@shared/users';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export interface OutboxPage {
  /** 1-based page number. */
  page: number;
  pageSize: number;
}

export const OUTBOX_PAGE_SIZE = 25;

/** GET /api/outbox?page=&pageSize= → { messages, total }, newest first (admin). */
export async function getOutbox({ page, pageSize }: OutboxPage) {
  return api.get('/api/outbox', { query: { page, pageSize }, schema: outboxResponseSchema });
}

export const outboxQueryOptions = (params: OutboxPage) =>
  queryOptions({
    queryKey: queryKeys.outbox.list(params),
    queryFn: () => getOutbox(params),
    // The outbox is a live log: always check on opening, and keep checking while mail is queued.
    staleTime: 0,
    refetchInterval: (query) => (query.state.data?.messages.some((message) => message.status === 'queued') ? 3000 : false),
  });
