import { formatCount, formatPercent } from './format';
import { segmentValueLabel, type MixedStrategyResult } from './mixed-strategy';
import { statedBadRate } from './stated-bad-rate';

/**
 * A conditional adoption in words: which values keep the champion and what the mixed strategy
 * does beside the champion and pure adoption. One copy, used by the decision page, the printable
 * report, the PDF pack and the decision e-mail.
 */
export function keptValuesText(strategy: Pick<MixedStrategyResult, 'keepChampion'>): string {
  const names = strategy.keepChampion.map(segmentValueLabel);
  return names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}

/** "The challenger", or with several challengers "The challenger “CF-4 open banking” (challenger 2)". */
export function strategyChallengerText(strategy: Pick<MixedStrategyResult, 'challenger' | 'challengerName'>): string {
  return strategy.challengerName === undefined ? 'The challenger' : `The challenger “${strategy.challengerName}” (challenger ${(strategy.challenger ?? 0) + 1})`;
}

export function mixedStrategySentences(strategy: MixedStrategyResult): string[] {
  const { champion, pure, mixed } = strategy;
  const book = (b: { approvalRate: number | null; badRate: number | null; inferredBadRate?: number | null }) => `approves ${formatPercent(b.approvalRate)} with a bad rate of ${formatPercent(statedBadRate(b), 2)}`;
  return [
    `${strategyChallengerText(strategy)} decides every account except those in ${keptValuesText(strategy)} (${formatCount(strategy.keptAccounts)} accounts), which keep the champion; both cut-offs are those for a ${formatPercent(strategy.approvalRate)} approval rate (champion ${strategy.cutoffs.champion}, challenger ${strategy.cutoffs.challenger}).`,
    `The mixed strategy ${book(mixed)}; the champion ${book(champion)}; the challenger everywhere ${book(pure)}.`,
    `Against the champion, the mixed strategy swaps in ${formatCount(mixed.swapIn.count)} accounts (bad rate ${formatPercent(statedBadRate(mixed.swapIn), 2)}) and swaps out ${formatCount(mixed.swapOut.count)} (bad rate ${formatPercent(
      statedBadRate(mixed.swapOut),
      2,
    )}); pure adoption swaps in ${formatCount(pure.swapIn.count)} (${formatPercent(statedBadRate(pure.swapIn), 2)}) and out ${formatCount(pure.swapOut.count)} (${formatPercent(statedBadRate(pure.swapOut), 2)}).`,
    ...(strategy.inference
      ? [
          `Bad rates count the accounts with an outcome and, for the applicants without one, the bads inferred by the run's reject inference (${strategy.inference === 'column' ? 'a probability of bad from a mapped column' : 'parcelling by champion score band'}): an assumption, not an observation.`,
        ]
      : []),
  ];
}
