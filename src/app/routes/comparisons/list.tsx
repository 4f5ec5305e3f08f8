import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useCallback } from 'react';
import { type LoaderFunctionArgs, useNavigate, useNavigation, useSearchParams } from 'react-router';
import { comparisonStateSchema, listComparisonsQuerySchema } from '@shared/comparisons';
import { paths } from '@/config/paths';
import { hasRole, useUser } from '@/lib/auth';
import { ButtonLink } from '@/components/button';
import { DocumentTitle } from '@/components/document-title';
import { EmptyState } from '@/components/empty-state';
import { PageHeader } from '@/components/page-header';
import { type ComparisonListParams, comparisonsQueryOptions } from '@/features/comparisons/api/get-comparisons';
import { type ComparisonFilterValues, ComparisonFilters } from '@/features/comparisons/components/comparison-filters';
import { ComparisonsTable } from '@/features/comparisons/components/comparisons-table';
import { requireUser } from '@/app/guards';

const PAGE_SIZE = 20;

/** The list's query from the URL; anything unreadable falls back to the defaults. */
function paramsFrom(search: URLSearchParams): ComparisonListParams {
  const state = comparisonStateSchema.safeParse(search.get('state'));
  const parsed = listComparisonsQuerySchema.safeParse({
    state: state.success ? state.data : undefined,
    q: search.get('q') ?? undefined,
    page: search.get('page') ?? undefined,
    sort: search.get('sort') ?? undefined,
    pageSize: PAGE_SIZE,
  });
  return parsed.success ? parsed.data : { page: 1, pageSize: PAGE_SIZE, sort: 'updated-desc' };
}

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireUser(queryClient, request);
  await queryClient.ensureQueryData(comparisonsQueryOptions(paramsFrom(new URL(request.url).searchParams)));
  return null;
};

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { data: user } = useUser();
  const params = paramsFrom(search);
  // The loader filled the cache for these parameters; a failed load shows the route's error boundary.
  const list = useSuspenseQuery(comparisonsQueryOptions(params));
  // While the next page or filter loads, the router keeps this one on screen, dimmed.
  const loadingNext = useNavigation().state === 'loading';
  const isModeler = hasRole(user, 'modeler');
  const filtered = !!params.state || !!params.q;

  const onFilter = useCallback(
    (values: ComparisonFilterValues) => navigate(paths.comparisons.list({ state: values.state, q: values.q, sort: values.sort }), { replace: true }),
    [navigate],
  );

  return (
    <>
      <DocumentTitle>Comparisons</DocumentTitle>
      <PageHeader
        title="Comparisons"
        subtitle="Each comparison puts a challenger model against the champion on one holdout: the evidence, the review and the decision."
        actions={
          isModeler ? (
            <ButtonLink to={paths.comparisons.new()} variant="primary">
              New comparison
            </ButtonLink>
          ) : null
        }
      />
      <div className="space-y-5">
        <ComparisonFilters values={{ state: params.state, q: params.q ?? '', sort: params.sort }} onChange={onFilter} />
        {list.data.items.length === 0 && list.data.total > 0 ? (
          <EmptyState
            title="This page is past the last comparison"
            action={
              <ButtonLink to={paths.comparisons.list({ state: params.state, q: params.q, sort: params.sort })} size="sm">
                Go to the first page
              </ButtonLink>
            }
          />
        ) : (
          <div aria-busy={loadingNext || undefined} className={loadingNext ? 'opacity-70 transition-opacity' : undefined}>
            <ComparisonsTable
              items={list.data.items}
              total={list.data.total}
              pageIndex={params.page - 1}
              pageSize={params.pageSize}
              onPageChange={(index) => navigate(paths.comparisons.list({ state: params.state, q: params.q, sort: params.sort, page: index + 1 }))}
              empty={
                filtered ? (
                  <EmptyState
                    title="No comparison matches these filters"
                    action={
                      <ButtonLink to={paths.comparisons.list()} size="sm">
                        Clear the filters
                      </ButtonLink>
                    }
                  >
                    Try another state or search word.
                  </EmptyState>
                ) : (
                  <EmptyState
                    title="No comparisons yet"
                    action={
                      isModeler ? (
                        <ButtonLink to={paths.comparisons.new()} variant="primary" size="sm">
                          Start the first comparison
                        </ButtonLink>
                      ) : null
                    }
                  >
                    {isModeler
                      ? 'Upload a holdout scored by the champion and the challenger to start.'
                      : 'A modeler starts a comparison by uploading a holdout; it appears here for everyone to read.'}
                  </EmptyState>
                )
              }
            />
          </div>
        )}
      </div>
    </>
  );
}
