import { useMemo } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { type BandTable as BandTableData } from '@shared/report';
import { formatCount, formatGini, formatKs, formatNumber, formatPercent, formatScore } from '@/lib/format';
import { DataTable } from '@/components/data-table';

type BandRow = BandTableData['rows'][number];
const column = createColumnHelper<BandRow>();

const columnsFor = (population: boolean) => [
  column.accessor('band', { header: 'Band', meta: { numeric: true, rowHeader: true } }),
  column.display({
    id: 'range',
    header: 'Scores',
    meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
    cell: ({ row }) => `${formatScore(row.original.scoreMin)} to ${formatScore(row.original.scoreMax)}`,
  }),
  column.accessor('count', { header: population ? 'Applicants' : 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(Math.round(getValue())) }),
  // With applicants without an outcome or weights: those without one; goods, bads and the bad
  // rate are of the applicants with an outcome (weighted).
  ...(population
    ? [column.accessor((row) => row.unknown ?? 0, { id: 'unknown', header: 'Without an outcome', meta: { numeric: true }, cell: ({ getValue }) => formatCount(Math.round(getValue())) })]
    : []),
  column.accessor('goods', { header: 'Goods', meta: { numeric: true }, cell: ({ getValue }) => formatCount(Math.round(getValue())) }),
  column.accessor('bads', { header: 'Bads', meta: { numeric: true }, cell: ({ getValue }) => formatCount(Math.round(getValue())) }),
  column.accessor('badRate', { header: population ? 'Bad rate, known outcomes' : 'Bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('cumBadShare', { header: 'Cumulative bads', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('cumGoodShare', { header: 'Cumulative goods', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  column.accessor('ks', { header: 'KS (points)', meta: { numeric: true }, cell: ({ getValue }) => formatKs(getValue()) }),
  column.accessor('odds', { header: 'Good:bad odds', meta: { numeric: true }, cell: ({ getValue }) => (getValue() === null ? '— (no bads)' : `${formatNumber(getValue(), 1)} : 1`) }),
];

/**
 * A model's gains table: quantile bands from the riskiest (band 1), with the trapezoid Gini. With
 * `population` (applicants without an outcome or weights): applicants weighted, and those without
 * an outcome in a column of their own.
 */
export function BandTable({ table, title, gini, population = false }: { table: BandTableData; title: string; gini: number; population?: boolean }) {
  const columns = useMemo(() => columnsFor(population), [population]);
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
