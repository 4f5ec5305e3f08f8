import { type SwapMatrix } from '@shared/report';
import { cn } from '@/lib/cn';
import { formatCount, formatPercent, formatScore } from '@/lib/format';
import { heatLevel } from '@/features/swap-sets/lib/swap-controls';

const shades = ['bg-paper-raised text-ink-faint', 'bg-court-50 text-ink', 'bg-court-100 text-ink', 'bg-court-200 text-ink', 'bg-court-400 text-white', 'bg-court-600 text-white'];

/**
 * The swap matrix as a heat map: champion band (rows) × challenger band (columns), band 1 the
 * riskiest, each cell with its count and bad rate printed; the shade follows the count. Cells on
 * the diagonal (outlined) are accounts both models put in the same band.
 */
export function SwapMatrixTable({ matrix }: { matrix: SwapMatrix }) {
  const max = Math.max(0, ...matrix.cells.flat().map((cell) => cell.count));
  return (
    <div className="space-y-3">
      <div className="overflow-x-auto">
        <table className="border-collapse text-xs" data-testid="swap-matrix">
          <caption className="sr-only">Accounts by champion band (rows) and challenger band (columns), with the bad rate of each cell</caption>
          <thead>
            <tr>
              <th scope="col" className="px-2 py-1 text-left align-bottom font-semibold text-ink-soft">
                Champion ↓ · Challenger →
              </th>
              {matrix.challengerBands.map((band) => (
                <th key={band.band} scope="col" className="min-w-16 px-1 py-1 text-center align-bottom font-semibold text-ink">
                  <span className="block">{band.band}</span>
                  <span className="num block font-normal text-ink-soft">
                    {formatScore(band.scoreMin)}–{formatScore(band.scoreMax)}
                  </span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {matrix.cells.map((row, i) => {
              const band = matrix.championBands[i];
              return (
                <tr key={band?.band ?? i}>
                  <th scope="row" className="px-2 py-1 text-left font-semibold whitespace-nowrap text-ink">
                    {band?.band ?? i + 1}{' '}
                    <span className="num font-normal text-ink-soft">
                      {band ? `${formatScore(band.scoreMin)}–${formatScore(band.scoreMax)}` : ''}
                    </span>
                  </th>
                  {row.map((cell, j) => (
                    <td
                      key={j}
                      className={cn('num border border-paper px-1 py-1 text-center', shades[heatLevel(cell.count, max)], i === j && 'outline-2 -outline-offset-2 outline-ink')}
                    >
                      <span className="block font-semibold">{formatCount(cell.count)}</span>
                      <span className="block opacity-90">{cell.count > 0 ? formatPercent(cell.badRate, 0) : ''}</span>
                    </td>
                  ))}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center gap-3 text-xs text-ink-soft">
        <span>Shade by number of accounts:</span>
        {shades.slice(1).map((shade, index) => (
          <span key={shade} className="inline-flex items-center gap-1">
            <span className={cn('inline-block size-4 rounded-sm border border-line', shade)} aria-hidden="true" />
            {index === 0 ? 'fewest' : index === shades.length - 2 ? 'most' : ''}
          </span>
        ))}
        <span>· outlined: same band in both models · each cell: accounts, then bad rate</span>
      </div>
    </div>
  );
}
