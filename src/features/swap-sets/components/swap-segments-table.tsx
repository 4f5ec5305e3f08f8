import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { swapRowsHaveUnknownOrWeights } from '@shared/population';
import { type SegmentSwapCell, type SwapSegmentRow, statedBadRate, swapInRiskier } from '@shared/report';
import { formatCount, formatInterval, formatPercent, formatSignedNumber } from '@/lib/format';
import { DataTable } from '@/components/data-table';
import { EmptyState } from '@/components/empty-state';
import { Select } from '@/components/select';
import { StatusBadge } from '@/components/status-badge';

const column = createColumnHelper<SwapSegmentRow>();

/** Champion's figure → challenger's, on one line; read out as "champion …, challenger …". */
function Change({ champion, challenger }: { champion: string; challenger: string }) {
  return (
    <span className="whitespace-nowrap">
      <span className="sr-only">champion </span>
      {champion}{' '}
      <span className="text-ink-faint" aria-hidden="true">
        →
      </span>
      <span className="sr-only">, challenger</span> <span className="font-medium text-ink">{challenger}</span>
    </span>
  );
}

/**
 * Count, bad rate and its interval of a swap-in or swap-out cell within one segment value. With
 * applicants without an outcome or weights: applicants (weighted), how many have no outcome, and
 * the bad rate the run states — inferred, and named so, when the run infers their bads.
 */
function SwapCellView({ cell }: { cell: SegmentSwapCell }) {
  const accounts = cell.accounts ?? cell.count;
  const unknown = cell.unknown ?? 0;
  const inferred = cell.inferred !== undefined && cell.inferred !== null && unknown > 0;
  return (
    <span className="inline-flex flex-col items-end whitespace-nowrap">
      <span>
        <span className="font-medium text-ink">{formatCount(Math.round(accounts))}</span>
        {cell.count > 0 ? <span className="text-ink-soft"> at {formatPercent(inferred ? statedBadRate(cell) : cell.badRate)}</span> : null}
        {inferred ? <span className="text-ink-soft italic"> inferred</span> : null}
      </span>
      {unknown > 0 ? (
        <span className="text-xs text-ink-soft">
          {formatCount(Math.round(unknown))} without an outcome{inferred ? `; known ${formatPercent(cell.badRate)}` : ''}
        </span>
      ) : null}
      {cell.badRateCi ? <span className="text-xs text-ink-soft">{formatInterval(cell.badRateCi, formatPercent)}</span> : null}
    </span>
  );
}

/**
 * The swap sets within each value of each mapped segment column, at the cut-offs on screen: each
 * model's approval rate and the bad rate of what it approves, the net change in approvals, and
 * the swap-in and swap-out with bad rates and their Wilson intervals. A row whose swap-in bad
 * rate is above its swap-out's says so in words.
 */
export function SwapSegmentsTable({ rows, confidence }: { rows: SwapSegmentRow[]; confidence: string }) {
  const segmentColumns = [...new Set(rows.map((row) => row.column))];
  const [shown, setShown] = useState<string>('');
  const visible = shown === '' ? rows : rows.filter((row) => row.column === shown);
  // The column's name only while rows of several columns are shown.
  const oneColumn = shown !== '' || segmentColumns.length === 1;
  const population = swapRowsHaveUnknownOrWeights(rows);
  const columns = [
    ...(oneColumn ? [] : [column.accessor('column', { header: 'Column', cell: ({ getValue }) => <code className="font-mono text-xs">{getValue()}</code> })]),
    column.accessor('value', { header: oneColumn ? (shown || segmentColumns[0]) : 'Value', meta: { rowHeader: true, cellClassName: 'whitespace-nowrap' } }),
    column.accessor((row) => swapInRiskier(row), {
      id: 'flag',
      // Beside the value, so the flag is seen without scrolling the table sideways.
      header: 'Flags',
      cell: ({ getValue }) =>
        getValue() ? (
          <StatusBadge tone="caution" className="whitespace-normal!">Swap-in riskier than swap-out</StatusBadge>
        ) : (
          <span className="text-ink-faint">none</span>
        ),
    }),
    column.accessor('accounts', { header: population ? 'Applicants' : 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(Math.round(getValue())) }),
    ...(population
      ? [
          column.accessor((row) => row.unknown ?? 0, {
            id: 'unknown',
            header: 'Without an outcome',
            meta: { numeric: true },
            cell: ({ getValue }) => formatCount(Math.round(getValue())),
          }),
        ]
      : []),
    column.accessor((row) => row.challenger.approvalRate - row.champion.approvalRate, {
      id: 'approval',
      header: 'Approval rate',
      meta: { numeric: true },
      cell: ({ row }) => <Change champion={formatPercent(row.original.champion.approvalRate)} challenger={formatPercent(row.original.challenger.approvalRate)} />,
    }),
    column.accessor((row) => row.challenger.approved - row.champion.approved, {
      id: 'net',
      header: 'Net approvals',
      meta: { numeric: true },
      cell: ({ getValue }) => formatSignedNumber(getValue(), 0),
    }),
    column.accessor(
      (row) =>
        row.challenger.approvedBadRate === null || row.champion.approvedBadRate === null ? undefined : row.challenger.approvedBadRate - row.champion.approvedBadRate,
      {
      id: 'approved-bad-rate',
      header: 'Bad rate of the approved book',
      meta: { numeric: true },
      sortUndefined: 'last',
      cell: ({ row }) => <Change champion={formatPercent(row.original.champion.approvedBadRate)} challenger={formatPercent(row.original.challenger.approvedBadRate)} />,
      },
    ),
    column.accessor((row) => row.swapIn.accounts ?? row.swapIn.count, {
      id: 'swap-in',
      header: 'Swap-in',
      meta: { numeric: true },
      cell: ({ row }) => <SwapCellView cell={row.original.swapIn} />,
    }),
    column.accessor((row) => row.swapOut.accounts ?? row.swapOut.count, {
      id: 'swap-out',
      header: 'Swap-out',
      meta: { numeric: true },
      cell: ({ row }) => <SwapCellView cell={row.original.swapOut} />,
    }),
  ];
  return (
    <div className="space-y-2">
      {segmentColumns.length > 1 ? (
        <Select
          label="Segment column"
          className="max-w-xs"
          value={shown}
          onChange={(event) => setShown(event.target.value)}
          options={[{ value: '', label: 'All columns' }, ...segmentColumns.map((name) => ({ value: name, label: name }))]}
        />
      ) : null}
      <DataTable
        data={visible}
        pagination={{ pageSize: 25 }}
        columns={columns}
        caption="Swap sets within each segment value, champion → challenger"
        density="compact"
        getRowId={(row) => `${row.column}=${row.value}`}
        empty={
          <EmptyState title="No segments in this analysis">
            Map one or more segment columns (product, channel, vintage…) to see where the challenger’s approvals move.
          </EmptyState>
        }
      />
      {rows.length > 0 ? (
        <p className="text-xs text-ink-soft">
          Bad-rate intervals are {confidence} Wilson intervals. A small segment’s rates move a lot with a few accounts; the Segments tab tests
          each model’s Gini within each value.
        </p>
      ) : null}
    </div>
  );
}
