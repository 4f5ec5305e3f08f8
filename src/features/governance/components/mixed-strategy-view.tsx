import { createColumnHelper } from '@tanstack/react-table';
import { segmentValueLabel, type MixedStrategyResult, type MixedStrategySegment, type StrategyBook } from '@shared/mixed-strategy';
import { statedBadRate } from '@shared/stated-bad-rate';
import { mixedStrategySentences } from '@shared/mixed-strategy-words';
import { formatCount, formatPercent } from '@/lib/format';
import { DataTable } from '@/components/data-table';

type Row = { name: string; book: StrategyBook; swapIn: string; swapOut: string };
const column = createColumnHelper<Row>();
const columns = [
  column.accessor('name', { header: 'Strategy', meta: { rowHeader: true } }),
  column.accessor((row) => row.book.approvalRate, { id: 'approval', header: 'Approval rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor((row) => row.book.accepted, { id: 'accepted', header: 'Approved', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor((row) => statedBadRate(row.book), { id: 'bad', header: 'Bad rate of the approved', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  column.accessor('swapIn', { header: 'Swap-in (bad rate)', meta: { numeric: true } }),
  column.accessor('swapOut', { header: 'Swap-out (bad rate)', meta: { numeric: true } }),
];

const segmentColumn = createColumnHelper<MixedStrategySegment>();
const segmentColumns = [
  segmentColumn.accessor((row) => segmentValueLabel(row), { id: 'value', header: 'Segment value', meta: { rowHeader: true } }),
  segmentColumn.accessor('kept', { header: 'Decided by', cell: ({ getValue }) => (getValue() ? 'Champion (kept)' : 'Challenger') }),
  segmentColumn.accessor('accounts', { header: 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  segmentColumn.accessor((row) => row.champion.approvalRate, { id: 'ca', header: 'Champion approves', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  segmentColumn.accessor((row) => statedBadRate(row.champion), { id: 'cb', header: 'Champion bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  segmentColumn.accessor((row) => row.mixed.approvalRate, { id: 'ma', header: 'Strategy approves', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  segmentColumn.accessor((row) => statedBadRate(row.mixed), { id: 'mb', header: 'Strategy bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  segmentColumn.accessor((row) => `${formatCount(row.mixed.swapIn.count)} / ${formatCount(row.mixed.swapOut.count)}`, { id: 'swaps', header: 'Swap-in / out', meta: { numeric: true } }),
];

const swapText = (cell: { count: number; badRate: number | null; inferredBadRate?: number | null }) => `${formatCount(cell.count)} (${formatPercent(statedBadRate(cell), 2)})`;

/**
 * A conditional adoption's figures: the sentences, the champion, pure adoption and the mixed
 * strategy side by side, and the segment values of the columns that hold a kept value.
 */
export function MixedStrategyView({ strategy, caption = 'The mixed strategy beside the champion and pure adoption' }: { strategy: MixedStrategyResult; caption?: string }) {
  const rows: Row[] = [
    { name: 'Champion (today)', book: strategy.champion, swapIn: '—', swapOut: '—' },
    { name: 'Challenger everywhere', book: strategy.pure, swapIn: swapText(strategy.pure.swapIn), swapOut: swapText(strategy.pure.swapOut) },
    { name: 'Challenger except the kept values', book: strategy.mixed, swapIn: swapText(strategy.mixed.swapIn), swapOut: swapText(strategy.mixed.swapOut) },
  ];
  const keptColumns = new Set(strategy.keepChampion.map((ref) => ref.column));
  const segments = strategy.bySegment.filter((row) => keptColumns.has(row.column));
  return (
    <div className="space-y-3" data-testid="mixed-strategy">
      {mixedStrategySentences(strategy).map((sentence) => (
        <p key={sentence} className="text-sm text-ink">
          {sentence}
        </p>
      ))}
      <DataTable data={rows} columns={columns} caption={caption} density="compact" enableSorting={false} />
      {segments.length > 0 ? (
        <DataTable data={segments} columns={segmentColumns} caption="By segment value, in the columns with a kept value" density="compact" enableSorting={false} />
      ) : null}
    </div>
  );
}
