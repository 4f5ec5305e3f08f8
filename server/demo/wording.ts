import type { Scenario } from '@shared/comparisons';
import { formatCount, formatGini, formatGiniDelta, formatPInWords, formatPercent } from '@shared/format';
import { type MixedStrategyResult } from '@shared/mixed-strategy';
import { statedBadRate } from '@shared/stated-bad-rate';
import type { Report, SegmentRow } from '@shared/report';

/**
 * What the demo people write: the submission message, the analyst's findings, the policy role's
 * annotations, the discussion, the votes and the decision. Every figure in these texts is taken
 * from the stored report or the saved scenario it talks about, so the words always agree with
 * the numbers on the pages (the seed test checks a few of them).
 */

// Figures written as on the pages (shared/format.ts).
const count = (value: number) => formatCount(value);
const gini = (value: number) => formatGini(value);
const signed = (value: number) => formatGiniDelta(value);
const percent = (value: number | null, digits = 1) => formatPercent(value, digits);
const pText = (p: number) => formatPInWords(p);

export function segment(report: Report, column: string, value: string): SegmentRow {
  const row = report.segments.find((candidate) => candidate.column === column && candidate.value === value);
  if (!row || row.deltaGini === null || row.championGini === null || row.challengerGini === null) {
    throw new Error(`the demo report has no usable segment ${column} = ${value}`);
  }
  return row;
}

/** The range of ΔGini over one segment column's values, e.g. "+0.9 to +7.0". */
function deltaRange(report: Report, column: string): string {
  const deltas = report.segments.filter((row) => row.column === column && row.deltaGini !== null).map((row) => row.deltaGini!);
  return `${signed(Math.min(...deltas))} to ${signed(Math.max(...deltas))}`;
}

/** 95% interval of a segment's ΔGini from its DeLong standard error (normal quantile 1.96). */
function segmentInterval(row: SegmentRow): string {
  if (row.giniSe === null) return '';
  return ` (95% interval ${signed(row.deltaGini! - 1.96 * row.giniSe)} to ${signed(row.deltaGini! + 1.96 * row.giniSe)})`;
}

export const brokeredCards = { column: 'product_channel', value: 'credit-card/broker' } as const;

export function submissionMessage(report: Report): string {
  return [
    `Through-the-door sample of the 2025 applications, ${count(report.population?.rows ?? report.rows)} rows standing for ${count(Math.round(report.population?.accounts ?? report.rows))} applicants, scored by both models: declined applicants have no outcome (the bureau's probability of bad states their bad rate), booked goods are sampled one in four (weight 4). Bootstrap ${count(report.bootstrap.replicates)} replicates, seed ${report.bootstrap.seed}.`,
    'Segments: product, channel, product × channel and application month. Please look closely at the broker channel: the cash-flow fields arrive from the brokers, not from our own bank-statement feed.',
  ].join('\n\n');
}

export function analystFindings(report: Report): string {
  const { champion, challenger, difference } = report;
  const cards = segment(report, brokeredCards.column, brokeredCards.value);
  const broker = segment(report, 'channel', 'broker');
  const brokeredLoans = segment(report, 'product_channel', 'personal-loan/broker');
  const quality = report.dataQuality;
  return [
    `Validated on the 2025 through-the-door sample: ${count(report.population?.rows ?? report.rows)} rows standing for ${count(Math.round(report.population?.accounts ?? report.rows))} applicants. Gini, KS and bad rates rest on the ${count(report.rows)} booked accounts with an outcome (${count(report.bads)} bads, weighted bad rate ${percent(report.badRate, 2)}); the ${count(Math.round(report.population?.unknown.accounts ?? 0))} declined applicants have none.`,
    `Discrimination. Challenger Gini ${gini(challenger.gini)} against ${gini(champion.gini)} for the champion: ΔGini ${signed(difference.gini)} points, 95% interval ${signed(difference.giniCi![0])} to ${signed(difference.giniCi![1])} (DeLong, one-sided ${pText(difference.pOneSided!)}). ` +
      (difference.giniBootstrapCi
        ? `The paired bootstrap (${count(report.bootstrap.replicates)} replicates) gives ${signed(difference.giniBootstrapCi[0])} to ${signed(difference.giniBootstrapCi[1])}, in line with DeLong. `
        : '') +
      `KS ${gini(challenger.ks)} against ${gini(champion.ks)}. The gain is significant and above the 2-point materiality threshold.`,
    `Stability. The difference is positive in every application month (${deltaRange(report, 'application_month')} points) and in both products (personal loans ${signed(segment(report, 'product', 'personal-loan').deltaGini!)}, cards ${signed(segment(report, 'product', 'credit-card').deltaGini!)}).`,
    `Weakness: brokered cards. In ${brokeredCards.column} = ${brokeredCards.value} (${count(cards.n)} accounts, ${count(cards.bads)} bads) the challenger is worse than the champion: Gini ${gini(cards.challengerGini!)} against ${gini(cards.championGini!)}, ΔGini ${signed(cards.deltaGini!)}${segmentInterval(cards)}. ` +
      `The broker channel as a whole shows ${signed(broker.deltaGini!)} only because brokered personal loans still gain ${signed(brokeredLoans.deltaGini!)}. ` +
      'Brokered card applications carry the broker-supplied cash-flow fields, which we do not verify, and the challenger leans on them. I recommend that the champion keeps deciding brokered card applications until that feed is verified.',
    `Swap-in. Every swap-in applicant was declined by the champion, so none has an outcome: its bad rate of ${percent(report.swap.swapIn.inferred?.badRate ?? null)} is inferred from the bureau's probability of bad (reject inference by column), against ${percent(report.swap.swapOut.badRate)} observed in the swap-out; with no inference it could be anything from ${percent(report.swap.swapIn.badRateBounds?.[0] ?? null, 0)} to ${percent(report.swap.swapIn.badRateBounds?.[1] ?? null, 0)}. I accept the bureau column as the working assumption and ask for the swap-in to be monitored from the first months on book.`,
    `Data. ${count(quality.rowsUsed)} of ${count(quality.rowsRead)} rows used, no missing scores${quality.duplicateIds === 0 ? ', no duplicate account ids' : ''}${quality.warnings.length > 0 ? `; warnings: ${quality.warnings.join('; ')}` : '; no data-quality warnings'}.`,
  ].join('\n\n');
}

export const scenarioNames = {
  current: 'Current approval rate (70%)',
  growth: 'Growth case (75%)',
} as const;

export function scenarioNote(kind: keyof typeof scenarioNames): string {
  return kind === 'current'
    ? 'The approval rate we run today across personal loans and cards.'
    : 'The growth case in the 2026 plan: five points more approvals at the same risk appetite.';
}

/** A saved scenario's swap set as the policy role reads it: applicants (weighted) and the bad rate the run states. */
function scenarioSet(cell: Scenario['swapIn']): { accounts: string; rate: string } {
  return { accounts: count(Math.round(cell.accounts ?? cell.count)), rate: percent(cell.inferredBadRate ?? cell.badRate) };
}

export function swapInAnnotation(current: Scenario, growth: Scenario): string {
  const [inNow, outNow, inGrowth, outGrowth] = [current.swapIn, current.swapOut, growth.swapIn, growth.swapOut].map(scenarioSet);
  return [
    `At our 70% approval rate the challenger swaps in ${inNow.accounts} applicants with a ${inNow.rate} bad rate for ${outNow.accounts} swapped out at ${outNow.rate}: a better book at about the same volume.`,
    'Every swap-in applicant is one we declined, so their bad rate is inferred from the bureau’s probability of bad (their performance at other lenders), not observed: if every one of them went bad it would be 100%, so monthly monitoring after go-live is the real check.',
    `At 75% the swap-in is ${inGrowth.accounts} applicants at ${inGrowth.rate} against ${outGrowth.accounts} at ${outGrowth.rate}, so the growth case also favours the challenger.`,
    'Brokered cards are the exception: in the swap sets by segment their swap-in is riskier than their swap-out, and the segments page shows the challenger weaker there. We will keep the champion cut-off for them, so their swap-ins are not taken on.',
  ].join(' ');
}

export function swapOutAnnotation(current: Scenario): string {
  return (
    `The ${scenarioSet(current.swapOut).accounts} accounts the challenger would decline at 70% need adverse-action reasons from the new model before go-live. ` +
    'The swap-out list is exported for Compliance to review for fair-lending effects alongside the reason codes.'
  );
}

export const discussion = {
  modelerOnBrokers:
    'On brokered cards: the data team has a fix in progress. From next quarter the broker cash-flow fields will be replaced by our own bank-statement retrieval for card applications, as for direct applications. We can re-run the comparison on the first months of applications after it is live.',
  committeeQuestion:
    'If we adopt with the champion kept for brokered cards, what is left of the gain? I would like to see it confirmed before we vote.',
  policyOnCompliance: 'Compliance has the swap-out list and the reason-code mapping; their review found no concern to hold the decision.',
} as const;

/** The analyst's answer to the committee's question: how much of the gain the brokered-cards condition leaves. */
export function analystAnswer(report: Report): string {
  const cards = segment(report, brokeredCards.column, brokeredCards.value);
  const others = report.segments.filter((row) => row.column === brokeredCards.column && row.value !== brokeredCards.value && row.deltaGini !== null);
  const deltas = others.map((row) => row.deltaGini!);
  return (
    `Brokered cards are ${percent((cards.accounts ?? cards.n) / (report.population?.accounts ?? report.rows), 0)} of the applicants. Every other product × channel cell gains on its own, between ${signed(Math.min(...deltas))} and ${signed(Math.max(...deltas))} Gini points (segments page, product_channel), ` +
    'so keeping the champion for brokered cards costs little of the uplift.'
  );
}

export const votes = {
  first: {
    vote: 'adopt',
    challenger: 0,
    comment: 'Adopt, with the champion kept for brokered cards until the broker feed is verified, and monthly monitoring of the swap-in.',
  },
  second: {
    vote: 'adopt',
    challenger: 0,
    comment: 'Adopt. The uplift is material and well beyond noise, and the swap-in book at our approval rate is better than what it replaces. Same conditions.',
  },
} as const;

/**
 * The committee's decision: adoption with the brokered cards kept on the champion, its figures
 * taken from the mixed strategy the product computed on the holdout (the same the decision stores).
 */
export function decision(report: Report, strategy: MixedStrategyResult): { rationale: string; conditions: string } {
  const { champion, pure, mixed } = strategy;
  const cards = segment(report, brokeredCards.column, brokeredCards.value);
  const rate = percent(strategy.approvalRate, 0);
  return {
    rationale: [
      `The challenger separates good from bad borrowers better on the 2025 out-of-time holdout (ΔGini ${signed(report.difference.gini)} points, DeLong one-sided ${pText(report.difference.pOneSided!)}), ` +
        `consistently across months and in every product × channel cell but one. That one is brokered cards (${brokeredCards.column} = ${brokeredCards.value}, ΔGini ${signed(cards.deltaGini!)}), ` +
        'where the segment rule flags the challenger as significantly worse; that is why the verdict is not proven, and why we do not adopt it there.',
      `We adopt the challenger everywhere except brokered cards, which keep the champion. Computed on the holdout at our ${rate} approval rate, this strategy approves ${percent(mixed.approvalRate)} of applicants with a bad rate of ${percent(statedBadRate(mixed), 2)}, ` +
        `against ${percent(statedBadRate(champion), 2)} for the champion at ${percent(champion.approvalRate)} and ${percent(statedBadRate(pure), 2)} for the challenger everywhere; ` +
        `it swaps in ${count(mixed.swapIn.count)} accounts at a ${percent(statedBadRate(mixed.swapIn), 2)} bad rate for ${count(mixed.swapOut.count)} swapped out at ${percent(statedBadRate(mixed.swapOut), 2)}` +
        `${strategy.inference ? ' (bad rates with the bureau’s probability of bad standing in for the applicants we never booked)' : ''}. ` +
        'Keeping the champion for brokered cards gives up little of the gain and none of the segment rule’s protection.',
      ...refitSentence(report),
    ].join('\n\n'),
    conditions: [
      '1. Brokered credit-card applications (product credit-card, channel broker) keep the champion’s decision until the broker cash-flow feed is replaced by verified bank-statement data and a re-run shows the challenger at least level there.',
      `2. Monitor the swap-in bad rate monthly against the swap-out’s at the ${rate} approval cut-off; report to the committee at 3 and 6 months on book.`,
      '3. Adverse-action reason codes from the challenger and the Compliance fair-lending review complete before go-live.',
      '4. Re-validate after 12 months or on any change to the cash-flow inputs.',
    ].join('\n'),
  };
}

/** Why the committee does not take the recommended challenger (the refit), from the report's figures; none without it. */
function refitSentence(report: Report): string[] {
  const challengers = report.challengers ?? [];
  const recommended = report.choice?.recommended ?? null;
  if (challengers.length < 2 || recommended === null || recommended === 0) return [];
  const refit = challengers[recommended];
  const cf3 = challengers[0];
  return [
    `The verdict recommends ${refit.name} instead, the only challenger it supports (ΔGini ${signed(refit.difference.gini)} points, Gini ${gini(refit.metrics.gini)} against ${gini(cf3.metrics.gini)} for ${cf3.name}). ` +
      `We decide against that recommendation on purpose: ${cf3.name} outside brokered cards keeps the larger uplift, and the one weakness that stops its verdict is handled by keeping the champion there.`,
  ];
}

export function pdSubmissionMessage(): string {
  return 'The first 60,000 applications of 2025, every outcome observed, with the challenger as the probability of default the scoring service returns (higher = riskier), recalibrated on the 2023 development sample (uploaded beside it as the reference for the PSI). Please look at the calibration by band and the stability by month before we wire the PD into the decision engine: the broker partnership has been sending self-declared cash-flow figures since July.';
}

export const comparisons = {
  decided: {
    name: 'Cash-flow challenger CF-3 vs application scorecard AS-19 — 2025 holdout',
    description:
      'The challenger adds cash-flow features from bank-statement data to the bureau and application data of the current scorecard. Out-of-time holdout: a through-the-door sample of the applications of January–December 2025 (every declined applicant and every bad, one booked good in four with weight 4); outcome 90+ days past due or charged off within 12 months, none for declined applicants, whose bad rate is inferred from the bureau’s probability of bad. A refit of the current scorecard on 2024 applications (AS-19 refit 2024) is compared beside it as a second challenger.',
  },
  inReview: {
    name: 'CF-3 as probability of default vs AS-19 — 2025 holdout',
    description:
      'The first 60,000 applications of 2025 with every outcome observed (a simulation’s view, for the calibration check), with the challenger delivered as a PD by the scoring service (higher = riskier) instead of points, recalibrated on the 2023 development sample.',
  },
  draft: {
    name: 'Quick look: 2,000-account sample of the 2025 holdout',
    description: 'An evenly spaced sample of the first 60,000 applications (every outcome observed), to try an alternative cut-off set-up before the full run. Mapping to follow.',
  },
} as const;
