import { z } from 'zod';

/**
 * Paged lists (notes, audit events): `?after=<id>&limit=<n>` gives the items with an id above
 * `after`, oldest first, at most `limit` of them (default 200, at most 500); the answer's
 * `nextAfter` is the id to ask after for the next page, or null on the last page. Each request's
 * work stays bounded however long the list grows.
 */
export const pageLimitDefault = 200;
export const pageLimitMax = 500;

export const pageQuerySchema = z.object({
  after: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(pageLimitMax, `at most ${pageLimitMax} a page`).default(pageLimitDefault),
});
export type PageQuery = z.infer<typeof pageQuerySchema>;

/** A page from `rows` read with `limit + 1`: the first `limit`, and nextAfter when there was one more. */
export function pageOf<T extends { id: number }>(rows: T[], limit: number): { items: T[]; nextAfter: number | null } {
  const more = rows.length > limit;
  const items = more ? rows.slice(0, limit) : rows;
  return { items, nextAfter: more ? items[items.length - 1].id : null };
}
