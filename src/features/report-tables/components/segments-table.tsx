import { createColumnHelper } from '@tanstack/react-table';
import { type SegmentRow } from '@shared/report';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatPValue } from '@/lib/format';
import { DataTable } from '@/components/data-table';
import { EmptyState } from '@/components/empty-state';
import { StatusBadge } from '@/components/status-badge';

const column = createColumnHelper<SegmentRow>();

/** A p-value with the words "below α" when the policy's level is met: never colour alone. */
function PCell({ p, alpha }: { p: number | null; alpha: number }) {
  return (
    <span className="inline-flex flex-col items-end">
      <span>{formatPValue(p)}</span>
      {p !== null && p < alpha ? <span className="text-xs font-medium text-good-strong">below α</span> : null}
    </span>
  );
}

/**
 * Both models within each value of each segment column (with `population`: also the applicants,
 * weights summed, and those without an outcome): n, bads, both Ginis, ΔGini with its
 * DeLong interval and two-sided p, the Holm-adjusted p across all segment rows, and the flags
 * (significantly worse, materially worse, too few bads).
 */
export function SegmentsTable({ segments, alpha, population = false }: { segments: SegmentRow[]; alpha: number; population?: boolean }) {
  // With applicants without an outcome or weights: the applicants each value stands for and those
  // without an outcome, beside the rows with an outcome the Ginis rest on.
  const populationColumns = population
    ? [
        column.accessor((row) => row.accounts ?? row.n, {
          id: 'applicants',
          header: 'Applicants',
          meta: { numeric: true },
          cell: ({ getValue }) => formatCount(Math.round(getValue())),
        }),
        column.accessor((row) => row.unknown ?? 0, {
          id: 'unknown',
          header: 'Without an outcome',
          meta: { numeric: true },
          cell: ({ getValue }) => formatCount(Math.round(getValue())),
        }),
      ]
    : [];
  const columns = [
    column.accessor('column', { header: 'Column', cell: ({ getValue }) => <code className="font-mono text-xs">{getValue()}</code> }),
    column.accessor('value', { header: 'Value', meta: { rowHeader: true } }),
    ...populationColumns,
    column.accessor('n', { header: population ? 'Rows with an outcome' : 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
    column.accessor('bads', { header: 'Bads', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
    column.accessor('championGini', { header: 'Champion Gini', meta: { numeric: true }, cell: ({ getValue }) => formatGini(getValue()) }),
    column.accessor('challengerGini', { header: 'Challenger Gini', meta: { numeric: true }, cell: ({ getValue }) => formatGini(getValue()) }),
    column.accessor('deltaGini', {
      header: 'ΔGini',
      meta: { numeric: true },
      sortUndefined: 'last',
      cell: ({ getValue }) => {
        const value = getValue();
        return (
          <span className="inline-flex items-center gap-1">
            {value !== null && value < 0 ? <span className="text-xs text-bad-strong">(worse)</span> : null}
            <span className="font-medium">{formatGiniDelta(value)}</span>
          </span>
        );
      },
    }),
    column.accessor('giniCi', { header: 'ΔGini interval', enableSorting: false, meta: { numeric: true }, cell: ({ getValue }) => formatInterval(getValue(), formatGiniDelta) }),
    column.accessor('p', { header: 'p, two-sided', meta: { numeric: true }, cell: ({ getValue }) => <PCell p={getValue()} alpha={alpha} /> }),
    column.accessor('pHolm', { header: 'p, Holm-adjusted', meta: { numeric: true }, cell: ({ getValue }) => <PCell p={getValue()} alpha={alpha} /> }),
    column.display({
      id: 'flags',
      header: 'Flags',
      cell: ({ row }) => {
        const { flags, tooFewBads } = row.original;
        if (flags.length === 0 && !tooFewBads) return <span className="text-ink-faint">none</span>;
        return (
          <span className="flex flex-wrap gap-1">
            {flags.includes('significantly-worse') ? <StatusBadge tone="bad">Significantly worse</StatusBadge> : null}
            {flags.includes('materially-worse') ? <StatusBadge tone="bad">Materially worse</StatusBadge> : null}
            {tooFewBads ? <StatusBadge tone="caution">Too few bads</StatusBadge> : null}
          </span>
        );
      },
    }),
    column.accessor('note', { header: 'Notes', enableSorting: false, cell: ({ getValue }) => <span className="text-ink-soft">{getValue() ?? ''}</span> }),
  ];
  return (
    <DataTable
      data={segments}
      columns={columns}
      caption="Both models within each segment"
      density="compact"
      getRowId={(row) => `${row.column}=${row.value}`}
      empty={
        <EmptyState title="No segments in this analysis">Map one or more segment columns (product, channel, vintage…) to compare the models within each value.</EmptyState>
      }
    />
  );
}
