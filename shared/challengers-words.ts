import {
  formatAuc,
  formatCount,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatNumber,
  formatPercent,
  formatPInWords,
  formatPValue,
  formatScore,
  MISSING,
} from './format';
import { type ChallengersSwapResult } from './comparisons';
import { type WordTable } from './word-table';
import {
  type ApprovalPatterns,
  type ChallengerResult,
  type Report,
  type SwapSets,
  type VerdictOutcome,
  championOf,
  statedBadRate,
} from './report';
import { flaggedSegmentsOf } from './challenger-sections';
import { segmentFlagsText } from './segments-words';

/**
 * Several challengers in words and tables, one copy for the comparison pages, the printable
 * report, the committee pack (PDF and workbook), the CSV exports and the e-mails, so each says
 * the same. Numbers go through shared/format.ts. A two-model comparison (one challenger) keeps
 * the pages and documents it had: `hasSeveralChallengers` is the switch.
 */

/** The verdict outcomes as a label (the verdict badge, the tables). */
export const verdictOutcomeLabels: Record<VerdictOutcome, string> = {
  supported: 'Challenger supported',
  'not-proven': 'Not proven',
  'champion-better': 'Champion better',
};

type ChallengersReport = Pick<Report, 'mapping' | 'champion' | 'challengers' | 'pairwise' | 'joint' | 'choice' | 'approvalPatterns'> & { policy?: Pick<Report['policy'], 'sided'> };

/** Two or more challengers: the pages and documents show the sections for several. */
export function hasSeveralChallengers(report: Pick<Report, 'challengers'>): report is Pick<Report, 'challengers'> & { challengers: ChallengerResult[] } {
  return (report.challengers?.length ?? 0) >= 2;
}

/** The champion's name as the modeler gave it (else its column). */
export function championName(report: Pick<Report, 'mapping'>): string {
  return championOf(report.mapping).name;
}

/** A challenger's name by its index (0 = the primary); "challenger N" when the report lacks it. */
export function challengerName(report: Pick<Report, 'challengers'>, index: number): string {
  return report.challengers?.[index]?.name ?? `challenger ${index + 1}`;
}

/** The recommended challenger's name, or null when none is recommended (or the report predates the choice). */
export function recommendedName(report: Pick<Report, 'challengers' | 'choice'>): string | null {
  const index = report.choice?.recommended;
  return index === null || index === undefined ? null : challengerName(report, index);
}

/**
 * Every model side by side: Gini, AUC and KS of each; for each challenger its ΔGini against the
 * champion with the DeLong interval, the p adjusted by Holm across the challengers (one- or
 * two-sided as the adoption policy tests), and its verdict. The champion first, the challengers in the modeler's order.
 */
export function modelsSummaryTable(report: ChallengersReport, confidence: number): WordTable {
  const level = `${Math.round(confidence * 100)}%`;
  const champion = report.champion;
  const twoSided = report.policy?.sided === 'two-sided';
  const rows: string[][] = [
    [championName(report), 'Champion', formatGini(champion.gini), formatAuc(champion.auc), formatKs(champion.ks), MISSING, MISSING, MISSING, MISSING],
  ];
  (report.challengers ?? []).forEach((challenger, index) => {
    const recommended = report.choice?.recommended === index;
    rows.push([
      challenger.name,
      `Challenger ${index + 1}${recommended ? ' (recommended)' : ''}`,
      formatGini(challenger.metrics.gini),
      formatAuc(challenger.metrics.auc),
      formatKs(challenger.metrics.ks),
      formatGiniDelta(challenger.difference.gini),
      formatInterval(challenger.difference.giniCi, formatGiniDelta),
      formatPValue(twoSided ? challenger.pTwoSidedHolm : challenger.pOneSidedHolm),
      verdictOutcomeLabels[challenger.verdict.outcome],
    ]);
  });
  return {
    head: ['Model', 'Role', 'Gini', 'AUC', 'KS', 'ΔGini vs champion', `${level} interval (DeLong)`, twoSided ? 'p, two-sided, Holm' : 'p, one-sided, Holm', 'Verdict'],
    rows,
  };
}

/** The joint DeLong test in one sentence. */
export function jointTestSentence(report: Pick<Report, 'joint' | 'challengers'>): string {
  const count = report.challengers?.length ?? 0;
  const joint = report.joint;
  const subject = count === 1 ? 'the challenger equals the champion' : `all ${count} challengers equal the champion`;
  if (!joint) return `The joint test that ${subject} could not be computed (no variance: too few goods or bads, or every model ranks the accounts alike).`;
  return `Joint test that ${subject} (DeLong, DeLong & Clarke-Pearson 1988): χ² = ${formatNumber(joint.chi2, 2)} on ${joint.df} degree${joint.df === 1 ? '' : 's'} of freedom, ${formatPInWords(joint.p)}.`;
}

/** Every pair of challengers: the later one minus the earlier, with the DeLong se, z and two-sided p (not adjusted). */
export function pairwiseTable(report: ChallengersReport): WordTable {
  return {
    head: ['Pair', 'ΔGini (second − first)', 'Standard error', 'z', 'p, two-sided'],
    rows: (report.pairwise ?? []).map((pair) => [
      `${challengerName(report, pair.b)} − ${challengerName(report, pair.a)}`,
      formatGiniDelta(pair.deltaGini),
      pair.se === null ? MISSING : formatGini(pair.se),
      pair.z === null ? MISSING : formatNumber(pair.z, 2),
      formatPValue(pair.pTwoSided),
    ]),
  };
}

/** Under the pairwise table: what its p-values are and are not. */
export const pairwiseNote =
  'Pairs of challengers are compared for information: their p-values are not adjusted for multiplicity and no verdict rests on them. The verdict judges each challenger against the champion.';

/** The sentence stating the recommended challenger (the report's own), or a fallback for older reports. */
export function choiceSentence(report: Pick<Report, 'choice'>): string {
  return report.choice?.summary ?? 'This report predates the choice among challengers.';
}

/** The caution beside every recommendation among several challengers. */
export const choiceCaution =
  'The recommendation applies the adoption policy to the evidence; it is not a decision. Which model to use rests with the institution’s policy and its committee, who weigh what the holdout cannot show.';

/** How the Holm adjustment enters the verdicts with several challengers. */
export function multiplicityNote(count: number): string {
  return `With ${count} challengers tested against the same champion, each challenger's significance criterion uses its p-value adjusted by Holm's method across the ${count} tests, so looking several times does not make a chance uplift look real.`;
}

/** One challenger's swap sets in a column of the side-by-side table. */
function swapColumn(swap: SwapSets): string[] {
  const rate = (cell: SwapSets['swapIn']) => formatPercent(statedBadRate(cell));
  return [
    `${formatScore(swap.champion.cutoff)} / ${formatScore(swap.challenger.cutoff)}`,
    formatCount(swap.swapIn.accounts ?? swap.swapIn.count),
    rate(swap.swapIn),
    formatCount(swap.swapOut.accounts ?? swap.swapOut.count),
    rate(swap.swapOut),
    formatPercent(statedBadRate(swap.bothAccept)),
  ];
}

/**
 * Each challenger's swap sets against the champion at the same approval rate, side by side: one
 * column per challenger, one row per figure.
 */
export function swapSideBySideTable(challengers: readonly { name: string; swap: SwapSets }[]): WordTable {
  const labels = ['Cut-off (champion / challenger)', 'Swap-in: applicants', 'Swap-in bad rate', 'Swap-out: applicants', 'Swap-out bad rate', 'Both approve: bad rate'];
  const columns = challengers.map((challenger) => swapColumn(challenger.swap));
  return {
    head: ['', ...challengers.map((challenger) => challenger.name)],
    rows: labels.map((label, row) => [label, ...columns.map((column) => column[row]!)]),
  };
}

/** The approval patterns as a table: one row per combination of approve / decline, champion first. */
export function approvalPatternsTable(patterns: ApprovalPatterns): WordTable {
  return {
    head: [...patterns.models.map((model) => model.name), 'Applicants', 'With an outcome', 'Bads', 'Bad rate'],
    rows: patterns.combinations.map((combination) => [
      ...combination.approved.map((approved) => (approved ? 'Approves' : 'Declines')),
      formatCount(combination.accounts),
      formatCount(combination.known),
      formatNumber(combination.bads, Number.isInteger(combination.bads) ? 0 : 1),
      formatPercent(combination.badRate),
    ]),
  };
}

/** One line under the approval patterns: the rate and each model's cut-off for it. */
export function approvalPatternsSentence(patterns: ApprovalPatterns): string {
  const cutoffs = patterns.models.map((model) => `${model.name} at ${formatScore(model.cutoff)}`).join(', ');
  return `Every model approves ${formatPercent(patterns.approvalRate)} of applicants at its own cut-off (${cutoffs}). Each row counts the applicants that exact combination of models approves and declines.`;
}

/** The model a decision (or an adopt vote) chose, in words: "CF-3 bureau (challenger 1)" or "the champion, CF-2". */
export function chosenModelWords(chosen: { model: 'champion' | 'challenger'; challenger: number | null; name: string } | null | undefined): string | null {
  if (!chosen) return null;
  if (chosen.model === 'champion') return `the champion, ${chosen.name}`;
  return `${chosen.name} (challenger ${(chosen.challenger ?? 0) + 1})`;
}

/** Each challenger's verdict in a row: its outcome, the criteria it fails, and the verdict's sentence. */
export function challengerVerdictsTable(report: Pick<Report, 'challengers' | 'choice'>): WordTable {
  return {
    head: ['Challenger', 'Verdict', 'Criteria not met', 'Summary'],
    rows: (report.challengers ?? []).map((challenger, index) => [
      `${challenger.name}${report.choice?.recommended === index ? ' (recommended)' : ''}`,
      verdictOutcomeLabels[challenger.verdict.outcome],
      challenger.verdict.criteria
        .filter((criterion) => !criterion.met)
        .map((criterion) => criterion.label)
        .join('; ') || 'None',
      challenger.verdict.summary,
    ]),
  };
}

/**
 * Every challenger's flagged segment values (significantly or materially worse than the champion:
 * the rows each verdict's segment rule was judged on), one row per challenger and value: the
 * challenger, the value, the flags, ΔGini with its interval and the Holm-adjusted two-sided p.
 * A challenger without segment rows in the report (older reports) is listed as not checked.
 */
export function flaggedSegmentsTable(report: Pick<Report, 'segments' | 'challengers'>): WordTable {
  const rows: string[][] = [];
  (report.challengers ?? []).forEach((challenger, index) => {
    const label = `${challenger.name} (challenger ${index + 1})`;
    if (index > 0 && challenger.segments === undefined) {
      rows.push([label, 'not checked: run the analysis again', MISSING, MISSING, MISSING, MISSING]);
      return;
    }
    for (const row of flaggedSegmentsOf(report, index)) {
      rows.push([label, `${row.column} = ${row.value}`, segmentFlagsText(row.flags), formatGiniDelta(row.deltaGini), formatInterval(row.giniCi ?? null, formatGiniDelta), formatPValue(row.pHolm)]);
    }
  });
  return { head: ['Challenger', 'Segment value', 'Flag', 'ΔGini', 'Interval', 'p, two-sided, Holm'], rows };
}

/** Under the flagged segments: what the flags mean, or that no challenger has one. */
export function flaggedSegmentsNote(table: WordTable): string {
  return table.rows.length === 0
    ? 'No segment value is significantly or materially worse for any challenger.'
    : 'Each challenger against the champion within each segment value, Holm-adjusted across that challenger’s rows; a value significantly worse with enough bads fails that challenger’s segment criterion.';
}

/** The 400's message for a challenger index the comparison does not have (votes, decisions, exports, the mixed strategy). */
export function noSuchChallengerMessage(index: number, count: number): string {
  return `Challenger ${index} does not exist: this comparison has ${count === 1 ? 'one challenger (0)' : `${count} challengers (0 to ${count - 1})`}.`;
}

/** A verdict record's choice among challengers, as the e-mails receive it. */
export interface ChoiceInWords {
  challengers: readonly { name: string; outcome: VerdictOutcome }[];
  recommended: number | null;
  summary: string;
}

/**
 * The lines an e-mail adds for several challengers: the recommended one (the record's sentence),
 * each challenger's verdict, and the caution. Empty with one challenger or no record, so a
 * two-model e-mail reads as before.
 */
export function choiceMailLines(choice: ChoiceInWords | null | undefined): string[] {
  if (!choice || choice.challengers.length < 2) return [];
  return [
    choice.summary,
    ...choice.challengers.map((challenger, index) => `  ${challenger.name}: ${verdictOutcomeLabels[challenger.outcome].toLowerCase()}${choice.recommended === index ? ' (recommended)' : ''}`),
    choiceCaution,
    '',
  ];
}

/**
 * The side-by-side swap sets the report holds (each challenger's `swap` at settings.approvalRate,
 * and the approval patterns) in the shape of POST …/challengers/swap; null for reports without them.
 */
export function reportChallengersSwap(report: Pick<Report, 'challengers' | 'approvalPatterns'>): ChallengersSwapResult | null {
  if (!report.challengers || !report.approvalPatterns) return null;
  return {
    approvalRate: report.approvalPatterns.approvalRate,
    challengers: report.challengers.map((challenger, index) => ({ challenger: index, column: challenger.column, name: challenger.name, swap: challenger.swap })),
    patterns: report.approvalPatterns,
  };
}

/** The note under "Each challenger's verdict", in the printable report and the PDF pack alike. */
export function challengerVerdictsNote(report: Pick<Report, 'verdict' | 'challengers'>): string {
  return `Under adoption policy version ${report.verdict.policyVersion}. The parts after this one detail the first challenger, ${report.challengers![0]!.name}.`;
}
