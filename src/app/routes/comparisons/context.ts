import { useOutletContext } from 'react-router';
import { type ComparisonDetail } from '@shared/comparisons';
import { type Report } from '@shared/report';

/** What the comparison shell hands its tab pages: the comparison and its current run's report. */
export interface ComparisonPageContext {
  comparison: ComparisonDetail;
  report: Report;
}

export function useComparisonPage(): ComparisonPageContext {
  return useOutletContext<ComparisonPageContext>();
}
