import type { AdoptionPolicy } from '@shared/policy';
import type { SegmentFlag, SegmentRow } from '@shared/report';

/**
 * The flags of one segment row under an adoption policy (issue: segments that can block adoption):
 *   significantly-worse  Holm-adjusted two-sided DeLong p < α and ΔGini < 0 (Holm 1979, Scand. J.
 *                        Statist. 6:65–70, across the report's segment rows);
 *   materially-worse     ΔGini ≤ −materiality (the policy's Gini points).
 * A value with fewer bads than the policy's segment threshold gets no flag: its Gini moves a lot
 * with a handful of accounts, so it is marked (tooFewBads) and left out of the rule.
 * Cost: O(1) per row.
 */
export function segmentFlags(
  row: Pick<SegmentRow, 'bads' | 'deltaGini' | 'pHolm'>,
  policy: Pick<AdoptionPolicy, 'alpha' | 'materialityGiniPoints' | 'segmentRule'>,
): SegmentFlag[] {
  if (row.deltaGini === null || tooFewBads(row, policy)) return [];
  const flags: SegmentFlag[] = [];
  if (row.pHolm !== null && row.pHolm < policy.alpha && row.deltaGini < 0) flags.push('significantly-worse');
  if (row.deltaGini * 100 <= -policy.materialityGiniPoints + 1e-9 && row.deltaGini < 0) flags.push('materially-worse');
  return flags;
}

export function tooFewBads(row: Pick<SegmentRow, 'bads'>, policy: Pick<AdoptionPolicy, 'segmentRule'>): boolean {
  return row.bads < policy.segmentRule.minBads;
}
