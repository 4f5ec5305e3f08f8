import { type ComponentType } from 'react';
import { paths } from '@/config/paths';
import { type StepTarget } from '@/features/comparisons/lib/next-step';

/**
 * The comparison's tabs, in order. Each is a page under the comparison shell (layout.tsx) with
 * its own URL and route module; router.tsx builds the child routes from this list, so a new tab
 * (Review, Report) is one entry here and its module.
 */
export interface ComparisonTab {
  key: StepTarget | 'curves' | 'segments' | 'bands' | 'data' | (string & {});
  label: string;
  path: (typeof paths.comparisons)['detail'];
  load: () => Promise<{ Component: ComponentType }>;
}

export const comparisonTabs: ComparisonTab[] = [
  { key: 'verdict', label: 'Verdict', path: paths.comparisons.detail, load: () => import('@/app/routes/comparisons/verdict') },
  { key: 'curves', label: 'Curves', path: paths.comparisons.curves, load: () => import('@/app/routes/comparisons/curves') },
  { key: 'swap-sets', label: 'Swap sets', path: paths.comparisons.swapSets, load: () => import('@/app/routes/comparisons/swap-sets') },
  { key: 'segments', label: 'Segments', path: paths.comparisons.segments, load: () => import('@/app/routes/comparisons/segments') },
  { key: 'bands', label: 'Bands', path: paths.comparisons.bands, load: () => import('@/app/routes/comparisons/bands') },
  { key: 'calibration', label: 'Calibration', path: paths.comparisons.calibration, load: () => import('@/app/routes/comparisons/calibration') },
  { key: 'stability', label: 'Stability', path: paths.comparisons.stability, load: () => import('@/app/routes/comparisons/stability') },
  { key: 'data', label: 'Data', path: paths.comparisons.data, load: () => import('@/app/routes/comparisons/data') },
  { key: 'review', label: 'Review & decision', path: paths.comparisons.review, load: () => import('@/app/routes/comparisons/review') },
  { key: 'report', label: 'Report', path: paths.comparisons.report, load: () => import('@/app/routes/comparisons/report') },
];

/** The URL a next step's button leads to, or null when its page is not part of the app yet. */
export function stepTargetUrl(target: StepTarget, id: number): string | null {
  if (target === 'setup') return paths.comparisons.setup(id);
  const tab = comparisonTabs.find((candidate) => candidate.key === target);
  return tab ? tab.path(id) : null;
}
