import type { SegmentRow } from '@shared/report';
import { type Holdout, levelOrder } from './holdout';

/**
 * With sampling weights or applicants without an outcome, each segment row's applicants
 * (`accounts`, summed weights over every row) and those without an outcome (`unknown`); the
 * rows themselves are computed on the accounts with an outcome (segments.ts). The same for every
 * challenger's rows: they depend on the segment values only. Common practice, no source.
 * Cost: O(n) per segment column.
 */
export function addSegmentPopulation(rows: SegmentRow[], holdout: Holdout): void {
  const weight = holdout.weight ?? null;
  const known = holdout.known ?? null;
  for (const column of holdout.segments) {
    const accounts = new Float64Array(column.levels.length);
    const unknown = new Float64Array(column.levels.length);
    for (let i = 0; i < holdout.n; i++) {
      const w = weight === null ? 1 : weight[i];
      accounts[column.codes[i]] += w;
      if (known !== null && !known[i]) unknown[column.codes[i]] += w;
    }
    for (const level of levelOrder(column.levels)) {
      const row = rows.find((candidate) => candidate.column === column.column && candidate.value === column.levels[level]);
      if (row) {
        row.accounts = accounts[level];
        row.unknown = unknown[level];
      }
    }
  }
}
