import { type ReactNode } from 'react';
import { fullSwapCell, type SwapCell, type SwapSets } from '@shared/report';
import { cn } from '@/lib/cn';
import { formatCount, formatInterval, formatMoney, formatPercent } from '@/lib/format';
import { ModelTag } from '@/components/model-tag';
import { approvedBooks } from '@/features/swap-sets/lib/swap-controls';

type CellKey = 'bothAccept' | 'swapIn' | 'swapOut' | 'bothReject';

const cellWords: Record<CellKey, { name: string; meaning: string }> = {
  bothAccept: { name: 'Both accept', meaning: 'approved either way' },
  swapOut: { name: 'Swap-out', meaning: 'champion accepts, challenger declines: newly declined' },
  swapIn: { name: 'Swap-in', meaning: 'champion declines, challenger accepts: newly approved' },
  bothReject: { name: 'Both decline', meaning: 'declined either way' },
};

const inferenceWords = { parcel: 'parcelling', column: 'the inferred-bad column' } as const;

function Cell({ cellKey, cell, confidence, hasAmount, highlight }: { cellKey: CellKey; cell: SwapCell; confidence: string; hasAmount: boolean; highlight?: boolean }) {
  const words = cellWords[cellKey];
  const full = fullSwapCell(cell);
  // Applicants without an outcome: their bad rate is not observed; say so, give the bounds and
  // any inferred rate as an assumption, never in the place of the observed one.
  const unknown = full.unknown > 0;
  return (
    <td className={cn('border border-line px-3 py-3 align-top', highlight ? 'bg-court-50' : 'bg-paper-raised')} data-cell={cellKey}>
      <p className="text-sm font-semibold text-ink">{words.name}</p>
      <p className="mb-2 text-xs text-ink-soft">{words.meaning}</p>
      <dl className="num grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
        <dt className="text-ink-soft">Accounts</dt>
        <dd className="text-right font-semibold text-ink" data-testid={`${cellKey}-count`}>
          {formatCount(full.accounts)}
        </dd>
        {cell.unknown !== undefined ? (
          <>
            <dt className="text-ink-soft">With an outcome</dt>
            <dd className="text-right">{formatCount(full.known)}</dd>
            <dt className="text-ink-soft">Without an outcome</dt>
            <dd className="text-right" data-testid={`${cellKey}-unknown`}>
              {formatCount(full.unknown)}
            </dd>
          </>
        ) : null}
        <dt className="text-ink-soft">Share</dt>
        <dd className="text-right">{formatPercent(cell.share)}</dd>
        <dt className="text-ink-soft">Bads</dt>
        <dd className="text-right">{formatCount(cell.bads)}</dd>
        <dt className="text-ink-soft">{unknown ? 'Bad rate, known outcomes' : 'Bad rate'}</dt>
        <dd className="text-right font-semibold text-ink" data-testid={`${cellKey}-bad-rate`}>
          {formatPercent(cell.badRate)}
        </dd>
        <dt className="text-ink-soft">{confidence} interval</dt>
        <dd className="text-right text-ink-soft">{formatInterval(cell.badRateCi, (value) => formatPercent(value))}</dd>
        {unknown ? (
          <>
            <dt className="text-ink-soft" title="Every applicant without an outcome good, or every one bad">
              All accounts, bounds
            </dt>
            <dd className="text-right" data-testid={`${cellKey}-bounds`}>
              {formatInterval(full.badRateBounds, (value) => formatPercent(value))}
            </dd>
            {full.inferred ? (
              <>
                <dt className="text-ink-soft">Inferred ({inferenceWords[full.inferred.method]})</dt>
                <dd className="text-right italic" data-testid={`${cellKey}-inferred`}>
                  {formatPercent(full.inferred.badRate)}
                </dd>
              </>
            ) : null}
          </>
        ) : null}
        {hasAmount ? (
          <>
            <dt className="text-ink-soft">Amount</dt>
            <dd className="text-right">{formatMoney(cell.amount)}</dd>
          </>
        ) : null}
      </dl>
      {unknown ? (
        <p className="mt-2 text-xs text-ink-soft">
          {formatCount(full.unknown)} of these applicants have no outcome (never booked).{' '}
          {full.inferred
            ? `The inferred rate assumes their bads from ${inferenceWords[full.inferred.method]}; it is not observed.`
            : 'Their bad rate is not known: anywhere within the bounds.'}
        </p>
      ) : null}
    </td>
  );
}

function Margin({ children }: { children: ReactNode }) {
  return <td className="border border-line bg-paper px-3 py-2 align-top text-xs text-ink-soft">{children}</td>;
}

/**
 * The 2×2 of who each model accepts: rows are the champion's decision, columns the challenger's.
 * Swap-in and swap-out are the accounts whose decision changes; the margins are each model's
 * approved book. Bad-rate intervals are Wilson score intervals (Wilson 1927).
 */
export function SwapTable({ swap, confidence, hasAmount, caption }: { swap: SwapSets; confidence: string; hasAmount: boolean; caption: string }) {
  const books = approvedBooks(swap);
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[40rem] border-collapse text-left">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <td className="border-0" />
            <th scope="col" className="border border-line bg-paper px-3 py-2 text-sm font-semibold">
              <span className="flex flex-wrap items-center gap-1.5">
                <ModelTag model="challenger" className="text-sm" /> accepts
              </span>
            </th>
            <th scope="col" className="border border-line bg-paper px-3 py-2 text-sm font-semibold">
              <span className="flex flex-wrap items-center gap-1.5">
                <ModelTag model="challenger" className="text-sm" /> declines
              </span>
            </th>
            <th scope="col" className="w-40 border border-line bg-paper px-3 py-2 text-xs font-semibold text-ink-soft">
              Champion’s book
            </th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row" className="border border-line bg-paper px-3 py-2 text-sm font-semibold">
              <span className="flex flex-wrap items-center gap-1.5">
                <ModelTag model="champion" className="text-sm" /> accepts
              </span>
            </th>
            <Cell cellKey="bothAccept" cell={swap.bothAccept} confidence={confidence} hasAmount={hasAmount} />
            <Cell cellKey="swapOut" cell={swap.swapOut} confidence={confidence} hasAmount={hasAmount} highlight />
            <Margin>
              Approves <span className="num font-semibold text-ink">{formatCount(books.champion.count)}</span> ({formatPercent(books.champion.share)})
              <br />
              bad rate <span className="num font-semibold text-ink">{formatPercent(books.champion.badRate)}</span>
            </Margin>
          </tr>
          <tr>
            <th scope="row" className="border border-line bg-paper px-3 py-2 text-sm font-semibold">
              <span className="flex flex-wrap items-center gap-1.5">
                <ModelTag model="champion" className="text-sm" /> declines
              </span>
            </th>
            <Cell cellKey="swapIn" cell={swap.swapIn} confidence={confidence} hasAmount={hasAmount} highlight />
            <Cell cellKey="bothReject" cell={swap.bothReject} confidence={confidence} hasAmount={hasAmount} />
            <Margin>&nbsp;</Margin>
          </tr>
          <tr>
            <th scope="row" className="border border-line bg-paper px-3 py-2 text-xs font-semibold text-ink-soft">
              Challenger’s book
            </th>
            <Margin>
              Approves <span className="num font-semibold text-ink">{formatCount(books.challenger.count)}</span> ({formatPercent(books.challenger.share)})
              <br />
              bad rate <span className="num font-semibold text-ink">{formatPercent(books.challenger.badRate)}</span>
            </Margin>
            <Margin>&nbsp;</Margin>
            <Margin>&nbsp;</Margin>
          </tr>
        </tbody>
      </table>
    </div>
  );
}
