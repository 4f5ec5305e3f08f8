import { type SwapSets } from '@shared/report';
import { formatPStatement, formatPercent, formatSignedNumber } from '@/lib/format';
import { StatusBadge } from '@/components/status-badge';

const methods = { 'two-proportion-z': 'two-proportion z test', 'fisher-exact': 'Fisher’s exact test' } as const;

/** Swap-in against swap-out bad rate: the test, its statistic and p, or why it could not run. */
export function SwapTest({ swap, alpha }: { swap: SwapSets; alpha: number }) {
  const { swapIn, swapOut, test } = swap;
  const better = swapIn.badRate !== null && swapOut.badRate !== null && swapIn.badRate <= swapOut.badRate;
  return (
    <div className="space-y-2 text-sm" data-testid="swap-test">
      <p className="flex flex-wrap items-center gap-2">
        <span className="font-semibold text-ink">Swap-in against swap-out</span>
        {swapIn.badRate !== null && swapOut.badRate !== null ? (
          <StatusBadge tone={better ? 'good' : 'bad'}>{better ? 'Swap-in bad rate not above swap-out' : 'Swap-in bad rate above swap-out'}</StatusBadge>
        ) : null}
      </p>
      <p className="text-ink-soft">
        The challenger newly approves {formatPercent(swapIn.badRate)} bad accounts (swap-in) where it newly declines {formatPercent(swapOut.badRate)} (swap-out).{' '}
        {test.p === null ? (
          <>The {methods[test.method]} could not run: {test.reason ?? 'one side is empty'}.</>
        ) : (
          <>
            {methods[test.method][0].toUpperCase() + methods[test.method].slice(1)}
            {test.z !== null ? `, z = ${formatSignedNumber(test.z)}` : ''}, two-sided {formatPStatement(test.p)}
            {test.p < alpha ? ': the difference is unlikely to be chance.' : ': the difference could be chance.'}
          </>
        )}
      </p>
    </div>
  );
}
