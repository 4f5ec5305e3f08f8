import { formatCount, formatGini, formatGiniDelta, formatInterval, formatPercent, formatPValue } from './format';
import { segmentsOf } from './challenger-sections';
import { type Report, type SegmentRow } from './report';
import { type WordedTable } from './word-table';

/**
 * Every challenger's segments table in one wording: the first challenger's (the report's own
 * `segments`) and each further challenger's (its `challengers[k].segments`) have the same columns,
 * the same p label and the same note, in the committee pack (PDF and workbook), the printable
 * report, the pages and the CLI text. Numbers go through shared/format.ts.
 */

type SegmentsReport = Pick<Report, 'segments' | 'challengers' | 'policy'> & { settings?: Pick<Report['settings'], 'confidence'> };

/** Said where the report has no segment rows. */
export const noSegmentsSentence = 'No segment columns were mapped.';

/**
 * How challenger k's segment p is sided: two-sided since engine 1.2 (harm and benefit alike can be
 * significant; the row then carries `pTwoSided`), the policy's sidedness in older reports.
 */
export function segmentPSidedness(report: Pick<Report, 'segments' | 'challengers' | 'policy'> | Pick<Report, 'segments' | 'policy'>, k = 0): 'one-sided' | 'two-sided' {
  const rows = segmentsOf({ challengers: undefined, ...report }, k);
  if (rows.some((row) => row.pTwoSided !== null && row.pTwoSided !== undefined)) return 'two-sided';
  return report.policy.sided === 'one-sided' ? 'one-sided' : 'two-sided';
}

/** The harm flags of a segment row in words ("Significantly worse; materially worse"). */
export function segmentFlagsText(flags: readonly string[]): string {
  const words = [flags.includes('significantly-worse') ? 'significantly worse' : null, flags.includes('materially-worse') ? 'materially worse' : null].filter((word) => word !== null);
  return words.length === 0 ? '' : `${words[0]!.charAt(0).toUpperCase()}${words[0]!.slice(1)}${words.length > 1 ? `; ${words[1]}` : ''}`;
}

/** The row's p as its column is labelled: the two-sided p when the row has it, else the p as stored. */
export const segmentP = (row: Pick<SegmentRow, 'p' | 'pTwoSided'>) => row.pTwoSided ?? row.p;

/** The columns of every challenger's segments table, in order (the tests hold the first challenger's to these). */
export function segmentsHead(report: SegmentsReport, k = 0): string[] {
  const level = report.settings ? `${formatPercent(report.settings.confidence, 0)} interval` : 'Interval';
  return ['Segment', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', level, `p, ${segmentPSidedness(report, k)}`, 'Holm p', 'Flag or note'];
}

/**
 * Challenger k against the champion within each segment value (k = 0, the first challenger: the
 * report's `segments`): per value the rows with an outcome, bads, both Ginis, ΔGini with its DeLong
 * interval, the DeLong p (two-sided since engine 1.2), the Holm-adjusted p across that challenger's
 * rows, and the harm flags its segment rule was judged on, "few bads" and any note. Null when the
 * challenger has no segment rows (no segment column mapped, or a report from before further
 * challengers had them).
 */
export function segmentsTable(report: SegmentsReport, k = 0): WordedTable | null {
  const rows = segmentsOf(report, k);
  if (rows.length === 0) return null;
  const sided = segmentPSidedness(report, k);
  return {
    note: `ΔGini per segment value with its DeLong interval and p (${sided}), and the p adjusted by Holm’s method across this challenger’s rows. Flags: significantly worse (Holm p below α, ΔGini below zero) or materially worse (ΔGini at or below minus the policy’s materiality); “few bads” marks values with too few bads to read, left out of the segment rule.`,
    head: segmentsHead(report, k),
    numeric: [1, 2, 3, 4, 5, 6, 7, 8],
    rows: rows.map((row) => [
      `${row.column} = ${row.value}`,
      formatCount(row.n),
      formatCount(row.bads),
      formatGini(row.championGini),
      formatGini(row.challengerGini),
      formatGiniDelta(row.deltaGini),
      formatInterval(row.giniCi ?? null, formatGiniDelta),
      formatPValue(segmentP(row)),
      formatPValue(row.pHolm),
      [segmentFlagsText(row.flags ?? []) || null, row.tooFewBads ? 'few bads' : null, row.note].filter(Boolean).join('; '),
    ]),
  };
}
