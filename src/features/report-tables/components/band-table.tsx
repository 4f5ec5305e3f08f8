import { createColumnHelper } from '@tanstack/react-table';
import { type BandTable as BandTableData } from '@shared/report';
import { formatCount, formatGini, formatKs, formatNumber, formatPercent, formatScore } from '@/lib/format';
import { DataTable } from '@/components/data-table';

type BandRow = BandTableData['rows'][number];
const column = createColumnHelper<BandRow>();

const columns = [
  column.accessor('band', { header: 'Band', meta: { numeric: true, rowHeader: true } }),
  column.display({
    id: 'range',
    header: 'Scores',
    meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
    cell: ({ row }) => `${formatScore(row.original.scoreMin)} to ${formatScore(row.original.scoreMax)}`,
  }),
  column.accessor('count', { header: 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('goods', { header: 'Goods', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('bads', { header: 'Bads', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('badRate', { header: 'Bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('cumBadShare', { header: 'Cumulative bads', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('cumGoodShare', { header: 'Cumulative goods', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('ks', { header: 'KS (points)', meta: { numeric: true }, cell: ({ getValue }) => formatKs(getValue()) }),
  column.accessor('odds', { header: 'Good:bad odds', meta: { numeric: true }, cell: ({ getValue }) => (getValue() === null ? '— (no bads)' : `${formatNumber(getValue(), 1)} : 1`) }),
];

/** A model's gains table: quantile bands from the riskiest (band 1), with the trapezoid Gini. */
export function BandTable({ table, title, gini }: { table: BandTableData; title: string; gini: number }) {
  return (
    <div className="space-y-2">
      <DataTable data={table.rows} columns={columns} caption={title} density="compact" enableSorting={false} getRowId={(row) => String(row.band)} />
      <p className="text-xs text-ink-soft">
        Trapezoid Gini over these bands <span className="num font-medium text-ink">{formatGini(table.giniTrapezoid)}</span> points (Engelmann, Hayden &amp;
        Tasche 2003), against <span className="num font-medium text-ink">{formatGini(gini)}</span> from every account: bands merge accounts, so
        the banded figure is usually a little lower.
      </p>
    </div>
  );
}
