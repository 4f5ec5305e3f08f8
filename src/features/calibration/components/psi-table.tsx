import { createColumnHelper } from '@tanstack/react-table';
import { type Psi } from '@shared/calibration';
import { formatNumber, formatPercent, formatScore } from '@/lib/format';
import { DataTable } from '@/components/data-table';

type Band = Psi['bands'][number];
const column = createColumnHelper<Band>();
const columns = [
  column.accessor('band', { header: 'Reference band', meta: { numeric: true, rowHeader: true } }),
  column.display({
    id: 'range',
    header: 'Scores',
    meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
    cell: ({ row }) => `${formatScore(row.original.scoreMin)} to ${formatScore(row.original.scoreMax)}`,
  }),
  column.accessor('referenceShare', { header: 'Reference share', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  column.accessor('actualShare', { header: 'Compared share', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  column.accessor('contribution', { header: 'Contribution to PSI', meta: { numeric: true }, cell: ({ getValue }) => formatNumber(getValue(), 4) }),
];

const ratingWords: Record<Psi['rating'], string> = { stable: 'below 0.1', watch: 'from 0.1 to 0.25', shifted: '0.25 or more' };

/** One model's PSI: the reference's bands, both shares and each band's part of the index. */
export function PsiTable({ psi, title }: { psi: Psi; title: string }) {
  return (
    <div className="space-y-2">
      <p className="text-sm text-ink-soft">
        PSI <span className="num font-semibold text-ink">{formatNumber(psi.psi, 4)}</span> ({ratingWords[psi.rating]}; the 0.1 and 0.25 lines are common
        practice, no source). Critical value <span className="num font-medium text-ink">{formatNumber(psi.criticalValue, 4)}</span> at α ={' '}
        {formatNumber(psi.criticalAlpha, 2)} for {psi.bands.length} bands, {formatNumber(psi.referenceSize, 0)} and {formatNumber(psi.actualSize, 0)} accounts
        (Yurdakul &amp; Naranjo): {psi.significant ? 'the two populations differ by more than sampling explains.' : 'no shift beyond sampling noise.'}
        {psi.emptyBandsAdjusted > 0 ? ` ${psi.emptyBandsAdjusted} empty bands were counted as half an account.` : ''}
      </p>
      <DataTable data={psi.bands} columns={columns} caption={title} density="compact" enableSorting={false} getRowId={(row) => String(row.band)} />
    </div>
  );
}
