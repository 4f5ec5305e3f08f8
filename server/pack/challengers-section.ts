import {
  challengerVerdictsNote,
  approvalPatternsSentence,
  approvalPatternsTable,
  challengerVerdictsTable,
  choiceCaution,
  choiceSentence,
  flaggedSegmentsNote,
  flaggedSegmentsTable,
  hasSeveralChallengers,
  jointTestSentence,
  modelsSummaryTable,
  multiplicityNote,
  pairwiseNote,
  pairwiseTable,
  swapSideBySideTable,
} from '@shared/challengers-words';
import { formatPercent } from '@shared/format';
import { segmentsTable } from '@shared/segments-words';
import { furtherSwapSegmentsTitle, swapSegmentsTable } from '@shared/pack/evidence-words';
import { type Report } from '@shared/report';
import { type WordTable, withFigures } from '@shared/word-table';
import { type Block, type PackInput, type PackTable, type Section } from './sections';

/**
 * The committee pack's section for several challengers (null with one): the recommended challenger
 * with its caution, every model side by side, the joint and pairwise tests, each challenger's
 * verdict, each challenger's flagged segment values, the swap sets side by side at the report's approval rate and the approval patterns.
 * Words and tables come from shared/challengers-words.ts, as on the pages and the printable report.
 */
export function packTable(title: string, table: WordTable, words: number[] = [], note?: string): PackTable {
  return {
    kind: 'table',
    title,
    ...(note ? { note } : {}),
    ...withFigures(table, words),
  };
}

/** The side-by-side tables at the report's approval rate; null for reports without them. */
export function sideBySide(report: Report): { approvalRate: number; swap: WordTable; patterns: WordTable; patternsNote: string } | null {
  if (!report.challengers || !report.approvalPatterns) return null;
  return {
    approvalRate: report.approvalPatterns.approvalRate,
    swap: swapSideBySideTable(report.challengers),
    patterns: approvalPatternsTable(report.approvalPatterns),
    patternsNote: approvalPatternsSentence(report.approvalPatterns),
  };
}

/**
 * Every challenger's flagged segment values (or the sentence that none has one), then each further
 * challenger's segment rows in full (the first challenger's are the pack's Segments section).
 */
function segmentBlocks(report: Report & { challengers: NonNullable<Report['challengers']> }): Block[] {
  const table = flaggedSegmentsTable(report);
  const flagged: Block =
    table.rows.length === 0 ? { kind: 'paragraph', text: flaggedSegmentsNote(table) } : packTable('Segments where a challenger is worse', table, [1, 2], flaggedSegmentsNote(table));
  const further = report.challengers.flatMap((challenger, k) => {
    const table = k === 0 ? null : segmentsTable(report, k);
    return table ? [{ kind: 'table' as const, title: `Segments: ${challenger.name} against the champion`, ...table }] : [];
  });
  return [flagged, ...further];
}

/** Each further challenger's swap sets within each segment value (the first's are in the swap sets section). */
function furtherSwapSegmentBlocks(report: Report & { challengers: NonNullable<Report['challengers']> }): Block[] {
  return report.challengers.flatMap((challenger, k) => {
    const table = k === 0 ? null : swapSegmentsTable({ swap: challenger.swap, settings: report.settings });
    return table ? [{ kind: 'table' as const, title: furtherSwapSegmentsTitle(challenger.name, challenger.swap), ...table }] : [];
  });
}

export function severalChallengers(input: PackInput): Section | null {
  const { report } = input;
  if (!hasSeveralChallengers(report)) return null;
  const count = report.challengers.length;
  const side = sideBySide(report);
  return {
    title: `One champion, ${count} challengers`,
    blocks: [
      { kind: 'paragraph', text: choiceSentence(report) },
      { kind: 'paragraph', muted: true, text: choiceCaution },
      packTable('Every model', modelsSummaryTable(report, report.settings.confidence), [1, 8], multiplicityNote(count)),
      { kind: 'paragraph', text: jointTestSentence(report) },
      packTable('Challengers against each other', pairwiseTable(report), [], pairwiseNote),
      packTable(
        "Each challenger's verdict",
        challengerVerdictsTable(report),
        [1, 2, 3],
        challengerVerdictsNote(report),
      ),
      ...segmentBlocks(report),
      ...(side
        ? [
            packTable(
              `Swap sets of every challenger at a ${formatPercent(side.approvalRate, 1)} approval rate`,
              side.swap,
              [],
              'Each challenger against the champion, both at their cut-offs for the same approval rate.',
            ),
            packTable('Who each model approves', side.patterns, report.approvalPatterns!.models.map((_, index) => index), side.patternsNote),
          ]
        : []),
      ...furtherSwapSegmentBlocks(report),
    ],
  };
}
