import { createColumnHelper } from '@tanstack/react-table';
import { type PeriodRow } from '@shared/calibration';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatKs, formatNumber } from '@/lib/format';
import { DataTable } from '@/components/data-table';

const column = createColumnHelper<PeriodRow>();
const columns = [
  column.accessor('period', { header: 'Period', meta: { rowHeader: true } }),
  column.accessor('accounts', { header: 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('bads', { header: 'Bads', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('championGini', { header: 'Champion Gini', meta: { numeric: true }, cell: ({ getValue }) => formatGini(getValue()) }),
  column.accessor('challengerGini', { header: 'Challenger Gini', meta: { numeric: true }, cell: ({ getValue }) => formatGini(getValue()) }),
  column.accessor('deltaGini', { header: 'ΔGini', meta: { numeric: true }, cell: ({ getValue }) => formatGiniDelta(getValue()) }),
  column.accessor('deltaGiniCi', {
    header: 'ΔGini interval',
    meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
    cell: ({ getValue }) => formatInterval(getValue(), formatGiniDelta),
  }),
  column.accessor('championKs', { header: 'Champion KS', meta: { numeric: true }, cell: ({ getValue }) => formatKs(getValue()) }),
  column.accessor('challengerKs', { header: 'Challenger KS', meta: { numeric: true }, cell: ({ getValue }) => formatKs(getValue()) }),
  column.accessor('championPsiFromPrevious', { header: 'Champion PSI vs previous', meta: { numeric: true }, cell: ({ getValue }) => formatNumber(getValue(), 3) }),
  column.accessor('challengerPsiFromPrevious', { header: 'Challenger PSI vs previous', meta: { numeric: true }, cell: ({ getValue }) => formatNumber(getValue(), 3) }),
  column.display({
    id: 'flag',
    header: 'Uplift',
    cell: ({ row }) =>
      row.original.signChanged ? (
        <span className="font-semibold text-bad-strong">sign changed</span>
      ) : row.original.note ? (
        <span className="text-ink-soft">{row.original.note}</span>
      ) : (
        <span className="text-ink-soft">same sign</span>
      ),
  }),
];

/** Discrimination by period (Gini and KS in points), ΔGini with its DeLong interval, PSI against the previous period. */
export function StabilityTable({ periods }: { periods: readonly PeriodRow[] }) {
  return <DataTable data={[...periods]} columns={columns} caption="Stability by period" density="compact" enableSorting={false} getRowId={(row) => row.period} />;
}
