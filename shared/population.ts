import type { Report, SwapSegmentRow } from './report';

/**
 * Whether a report's holdout has applicants without an outcome or sampling weights: then the
 * tables show applicants (weights summed) and those without an outcome beside the rows the
 * statistics rest on; otherwise they look as for a plain holdout. Reports before engine 1.2 have
 * neither.
 */
export function hasUnknownOrWeights(report: Pick<Report, 'population'>): boolean {
  const population = report.population;
  return population !== undefined && (population.unknown.rows > 0 || population.accounts !== population.rows);
}

/** The same question asked of swap sets by segment (swap cells carry accounts only then). */
export function swapRowsHaveUnknownOrWeights(rows: readonly Pick<SwapSegmentRow, 'swapIn' | 'swapOut' | 'unknown'>[]): boolean {
  return rows.some((row) => (row.unknown ?? 0) > 0 || row.swapIn.accounts !== undefined || row.swapOut.accounts !== undefined);
}
