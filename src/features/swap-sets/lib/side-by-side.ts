import { type Report } from '@shared/report';

/**
 * The side-by-side swap sets of several challengers: at the report's own approval rate the report
 * already holds them (each challenger's `swap` and the approval patterns), any other rate asks the
 * server. Pure, for the Swap sets page and its tests.
 */

/** Whether a typed approval rate can be asked for (strictly between 0 and 100%). */
export function validApprovalRate(rate: number): boolean {
  return Number.isFinite(rate) && rate > 0 && rate < 1;
}

/**
 * The rate to ask the server for, or null: an unusable rate (the last result stays) or the
 * report's own rate (the report has it; no request).
 */
export function challengersSwapRequest(rate: number, report: Pick<Report, 'approvalPatterns'>): number | null {
  if (!validApprovalRate(rate)) return null;
  if (report.approvalPatterns && Math.abs(rate - report.approvalPatterns.approvalRate) < 1e-12) return null;
  return rate;
}
