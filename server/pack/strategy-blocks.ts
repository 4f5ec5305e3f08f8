import { formatCount, formatPercent } from '@shared/format';
import { segmentValueLabel, type MixedStrategyResult, type StrategyBook } from '@shared/mixed-strategy';
import { statedBadRate } from '@shared/stated-bad-rate';
import { mixedStrategySentences } from '@shared/mixed-strategy-words';
import type { Block } from './sections';

/** A conditional adoption in the pack: its sentences, the three strategies side by side, and the values of the columns with a kept value. */
export function strategyBlocks(strategy: MixedStrategyResult): Block[] {
  const swap = (cell: { count: number; badRate: number | null; inferredBadRate?: number | null }) => `${formatCount(cell.count)} (${formatPercent(statedBadRate(cell), 2)})`;
  const row = (name: string, book: StrategyBook, swaps: [string, string]) => [name, formatPercent(book.approvalRate), formatCount(book.accepted), formatPercent(statedBadRate(book), 2), ...swaps];
  const keptColumns = new Set(strategy.keepChampion.map((ref) => ref.column));
  return [
    ...mixedStrategySentences(strategy).map((text): Block => ({ kind: 'paragraph', text })),
    {
      kind: 'table',
      title: 'The strategy adopted beside the champion and pure adoption',
      head: ['Strategy', 'Approval rate', 'Approved', 'Bad rate of the approved', 'Swap-in (bad rate)', 'Swap-out (bad rate)'],
      numeric: [1, 2, 3, 4, 5],
      rows: [
        row('Champion (today)', strategy.champion, ['—', '—']),
        row('Challenger everywhere', strategy.pure, [swap(strategy.pure.swapIn), swap(strategy.pure.swapOut)]),
        row('Challenger except the kept values', strategy.mixed, [swap(strategy.mixed.swapIn), swap(strategy.mixed.swapOut)]),
      ],
    },
    {
      kind: 'table',
      title: 'The strategy adopted by segment value',
      head: ['Segment value', 'Decided by', 'Accounts', 'Champion approves', 'Champion bad rate', 'Strategy approves', 'Strategy bad rate'],
      numeric: [2, 3, 4, 5, 6],
      rows: strategy.bySegment
        .filter((segment) => keptColumns.has(segment.column))
        .map((segment) => [
          segmentValueLabel(segment),
          segment.kept ? 'Champion (kept)' : 'Challenger',
          formatCount(segment.accounts),
          formatPercent(segment.champion.approvalRate),
          formatPercent(statedBadRate(segment.champion), 2),
          formatPercent(segment.mixed.approvalRate),
          formatPercent(statedBadRate(segment.mixed), 2),
        ]),
    },
  ];
}
