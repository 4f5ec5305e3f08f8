import type { Brier, Calibration, CalibrationRow, ModelCalibration, Stability } from '../calibration';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatKs, formatNumber, formatPercent, formatPValue, formatScore } from '../format';

/**
 * The calibration and stability section in words: titles, sentences and tables (by band or grade,
 * then the portfolio; by period; the PSI), as the committee pack (server/pack/calibration-section.ts)
 * and the printable report (report-calibration.tsx) both print them: one wording, each lays it out
 * in its own medium.
 */
export const calibrationHead = ['Group', 'Accounts', 'Mean PD', 'Bad rate', 'Wilson interval', 'Expected bads', 'Observed bads', 'Jeffreys p', 'Binomial p', 'PD'];

const pct2 = (value: number) => formatPercent(value, 2);

export function calibrationRowWords(row: CalibrationRow): string[] {
  return [
    row.label,
    formatCount(row.accounts),
    pct2(row.meanPd),
    pct2(row.observedBadRate),
    formatInterval(row.observedBadRateCi, pct2),
    formatNumber(row.expectedBads, 1),
    formatNumber(row.observedBads, 0),
    formatPValue(row.jeffreysP),
    formatPValue(row.binomialP),
    row.fails ? 'too low' : 'not rejected',
  ];
}

const modelName = { champion: 'Champion', challenger: 'Challenger' } as const;
type ModelKey = keyof typeof modelName;

/** The models whose score is confirmed as a probability of default, so have a calibration. */
export function calibratedModels(calibration: Calibration | undefined): ModelKey[] {
  return (['champion', 'challenger'] as const).filter((model) => calibration?.[model]);
}

/** Said when the report has a calibration section but neither score is a PD. */
export const noCalibrationSentence = 'Neither score is marked as a probability of default: no calibration.';

/** Said by the printable report for a report made before calibration and stability existed. */
export const noCalibrationSectionSentence = 'This report was made before calibration and stability were computed.';

/** "Champion: calibration by quantile band" or "Challenger: calibration by grade (grade)". */
export function calibrationTitle(model: ModelKey, result: ModelCalibration): string {
  return `${modelName[model]}: calibration by ${result.groupedBy.kind === 'grades' ? `grade (${result.groupedBy.column})` : 'quantile band'}`;
}

/** The tests behind the calibration table, its α and how many groups fail, and the intervals' level. */
export function calibrationTestsSentence(calibration: Pick<Calibration, 'alpha' | 'confidence'>, result: Pick<ModelCalibration, 'failing' | 'rows'>): string {
  const failing = result.failing === 0 ? 'none is' : `${formatCount(result.failing)} of ${formatCount(result.rows.length)}`;
  return `Jeffreys test (ECB 2019 instructions for IRB validation reporting) and exact binomial test, one-sided, H0: the PD is not underestimated; groups with Jeffreys p below α = ${formatNumber(calibration.alpha, 2)} are marked “too low”: ${failing}. Observed bad rates with their ${formatPercent(calibration.confidence, 0)} Wilson intervals.`;
}

/** A model's calibration table: its groups, then the portfolio. */
export function calibrationTable(result: ModelCalibration): { head: string[]; numeric: number[]; rows: string[][] } {
  return { head: calibrationHead, numeric: [1, 2, 3, 4, 5, 6, 7, 8], rows: [...result.rows, result.portfolio].map(calibrationRowWords) };
}

/** The Brier score with Murphy's (1973) decomposition, five decimals. */
export function brierFacts(brier: Brier): [string, string][] {
  return [
    ['Brier score', formatNumber(brier.brier, 5)],
    ['Reliability (Murphy 1973)', formatNumber(brier.reliability, 5)],
    ['Resolution', formatNumber(brier.resolution, 5)],
    ['Uncertainty', formatNumber(brier.uncertainty, 5)],
    ['Within groups', formatNumber(brier.withinGroup, 5)],
  ];
}

/** "Stability by month" */
export function stabilityTitle(stability: Pick<Stability, 'periodColumn'>): string {
  return `Stability by ${stability.periodColumn}`;
}

/** Whether the uplift keeps its sign across the periods with enough bads. */
export function stabilitySignSentence(stability: Pick<Stability, 'signChanges' | 'minBads'>): string {
  return stability.signChanges.length > 0
    ? `The uplift changes sign in ${stability.signChanges.join(', ')} (periods with at least ${formatCount(stability.minBads)} bads).`
    : `The uplift keeps its sign in every period with at least ${formatCount(stability.minBads)} bads.`;
}

/** Each period's Gini, ΔGini with its interval, KS and PSI from the previous period. */
export function stabilityTable(stability: Pick<Stability, 'periods'>): { head: string[]; numeric: number[]; rows: string[][] } {
  return {
    head: ['Period', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', 'ΔGini interval', 'KS champion / challenger', 'PSI vs previous', 'Note'],
    numeric: [1, 2, 3, 4, 5, 6, 7, 8],
    rows: stability.periods.map((row) => [
      row.period,
      formatCount(row.accounts),
      formatCount(row.bads),
      formatGini(row.championGini),
      formatGini(row.challengerGini),
      formatGiniDelta(row.deltaGini),
      formatInterval(row.deltaGiniCi, formatGiniDelta),
      `${formatKs(row.championKs)} / ${formatKs(row.challengerKs)}`,
      row.championPsiFromPrevious === null ? '—' : `${formatNumber(row.championPsiFromPrevious, 3)} / ${formatNumber(row.challengerPsiFromPrevious, 3)}`,
      row.signChanged ? 'sign changed' : (row.note ?? ''),
    ]),
  };
}

type PsiResult = NonNullable<Stability['psi']>;

/** What the PSI compares and where its critical values come from. */
export function psiSentence(psi: PsiResult): string {
  const reference = psi.reference.kind === 'file' ? `the development sample ${psi.reference.fileName}` : `period ${psi.reference.period}`;
  return `Against ${reference} (${formatCount(psi.reference.rows)} accounts), compared: ${psi.actual}. Critical value: Yurdakul & Naranjo; 0.1 / 0.25: common practice, no source.`;
}

/** Both models' PSI against the reference, with the critical value and the reading. */
export function psiTable(psi: PsiResult): { head: string[]; numeric: number[]; rows: string[][] } {
  return {
    head: ['Model', 'PSI', 'Critical value', 'α', 'Bands', 'Reading'],
    numeric: [1, 2, 3, 4],
    rows: (['champion', 'challenger'] as const).map((model) => {
      const value = psi[model];
      return [
        modelName[model],
        formatNumber(value.psi, 4),
        formatNumber(value.criticalValue, 4),
        formatNumber(value.criticalAlpha, 2),
        formatCount(value.bands.length),
        `${value.rating}; ${value.significant ? 'shift beyond sampling noise' : 'no significant shift'}`,
      ];
    }),
  };
}

/** One model's PSI by reference band: the shares and each band's contribution. */
export function psiBandsTable(psi: PsiResult, model: ModelKey): { title: string; head: string[]; numeric: number[]; rows: string[][] } {
  return {
    title: `${modelName[model]}: PSI by reference band`,
    head: ['Band', 'Score from', 'Score to', 'Reference share', 'Actual share', 'Contribution'],
    numeric: [0, 1, 2, 3, 4, 5],
    rows: psi[model].bands.map((band) => [
      formatCount(band.band),
      formatScore(band.scoreMin),
      formatScore(band.scoreMax),
      pct2(band.referenceShare),
      pct2(band.actualShare),
      formatNumber(band.contribution, 4),
    ]),
  };
}
