import type { BandTable, Report, SegmentRow } from './report';

/**
 * One challenger's own sections of a report, by its index in `challengers` (0 = the primary):
 * the primary's are the report's top-level sections, a further challenger's are kept in its
 * `challengers[k]` entry. One copy, so the pages, the printable report, the pack and the exports
 * read the same rows for the same challenger.
 */

/** Challenger k against the champion within each segment value (with the harm flags its verdict was judged on); [] when the report has none for it. */
export function segmentsOf(report: Pick<Report, 'segments' | 'challengers'>, k: number): SegmentRow[] {
  return k === 0 ? report.segments : (report.challengers?.[k]?.segments ?? []);
}

/** Challenger k's band table; null for a further challenger of a report from before band tables per challenger. */
export function bandsOf(report: Pick<Report, 'bands' | 'challengers'>, k: number): BandTable | null {
  return k === 0 ? report.bands.challenger : (report.challengers?.[k]?.bands ?? null);
}

/** The segment values where challenger k is significantly or materially worse than the champion. */
export function flaggedSegmentsOf(report: Pick<Report, 'segments' | 'challengers'>, k: number): SegmentRow[] {
  return segmentsOf(report, k).filter((row) => row.flags.length > 0);
}
