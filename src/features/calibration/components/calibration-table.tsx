import { createColumnHelper } from '@tanstack/react-table';
import { type CalibrationRow, type ModelCalibration } from '@shared/calibration';
import { formatCount, formatInterval, formatNumber, formatPercent, formatPValue } from '@/lib/format';
import { DataTable } from '@/components/data-table';

const column = createColumnHelper<CalibrationRow>();
const pct2 = (value: number) => formatPercent(value, 2);

const columns = [
  column.accessor('label', { header: 'Group', meta: { rowHeader: true } }),
  column.accessor('accounts', { header: 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('meanPd', { header: 'Mean PD', meta: { numeric: true }, cell: ({ getValue }) => pct2(getValue()) }),
  column.accessor('observedBadRate', { header: 'Bad rate', meta: { numeric: true }, cell: ({ getValue }) => pct2(getValue()) }),
  column.accessor('observedBadRateCi', {
    header: 'Wilson interval',
    meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
    cell: ({ getValue }) => formatInterval(getValue(), pct2),
  }),
  column.accessor('expectedBads', { header: 'Expected bads', meta: { numeric: true }, cell: ({ getValue }) => formatNumber(getValue(), 1) }),
  column.accessor('observedBads', { header: 'Observed bads', meta: { numeric: true }, cell: ({ getValue }) => formatNumber(getValue(), 0) }),
  column.accessor('jeffreysP', { header: 'Jeffreys p', meta: { numeric: true }, cell: ({ getValue }) => formatPValue(getValue()) }),
  column.accessor('binomialP', { header: 'Binomial p', meta: { numeric: true }, cell: ({ getValue }) => formatPValue(getValue()) }),
  column.accessor('fails', {
    header: 'PD',
    cell: ({ getValue }) => (getValue() ? <span className="font-semibold text-bad-strong">too low</span> : <span className="text-ink-soft">not rejected</span>),
  }),
];

/** Calibration by band or grade, the portfolio last. */
export function CalibrationTable({ calibration }: { calibration: ModelCalibration }) {
  const rows = [...calibration.rows, calibration.portfolio];
  return (
    <DataTable
      data={rows}
      columns={columns}
      caption={`Calibration by ${calibration.groupedBy.kind === 'grades' ? `grade (${calibration.groupedBy.column})` : 'quantile band'}, portfolio last`}
      density="compact"
      enableSorting={false}
      getRowId={(row) => row.label}
    />
  );
}
