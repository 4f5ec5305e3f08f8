import { queryOptions } from '@tanstack/react-query';
import { type ComparisonList, type ListComparisonsQuery, comparisonListSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export type ComparisonListParams = Pick<ListComparisonsQuery, 'page' | 'pageSize' | 'sort'> & Partial<Pick<ListComparisonsQuery, 'state' | 'q'>>;

/** GET /api/comparisons?state=&q=&page=&pageSize=&sort= (any signed-in person). */
export async function getComparisons(params: ComparisonListParams): Promise<ComparisonList> {
  return api.get('/api/comparisons', {
    query: { state: params.state, q: params.q || undefined, page: params.page, pageSize: params.pageSize, sort: params.sort },
    schema: comparisonListSchema,
  });
}

const isActive = (list: ComparisonList | undefined) =>
  list?.items.some((item) => item.latestRun?.status === 'queued' || item.latestRun?.status === 'running') ?? false;

export const comparisonsQueryOptions = (params: ComparisonListParams) =>
  queryOptions({
    queryKey: queryKeys.comparisons.list(params),
    queryFn: () => getComparisons(params),
    // While an analysis in the list runs, its progress and headline numbers follow.
    refetchInterval: (query) => (isActive(query.state.data) ? 2000 : false),
  });
