import type ExcelJS from 'exceljs';
import type { CalibrationRow, PeriodRow, Psi } from '@shared/calibration';
import type { Report } from '@shared/report';
import { col, F, facts, type Field, writeFields } from './workbook-tables';

/**
 * The workbook's calibration and stability sheets, written only when the report has them: the
 * calibration of each model whose score is confirmed as a probability of default (by band or
 * grade: mean PD, observed bad rate with its Wilson interval, expected and observed bads, the
 * Jeffreys and exact binomial p, the portfolio row, the Brier score and Murphy's decomposition),
 * and stability (Gini, KS and ΔGini by period; the PSI against the reference with its critical
 * value, and each band's contribution). Numbers are numbers, as the report holds them.
 */

const modelName = { champion: 'Champion', challenger: 'Challenger' } as const;

const calibrationFields: Field<CalibrationRow>[] = [
  col.text('Group', (row) => row.label, 16),
  col.text('Band', (row) => row.band),
  col.count('Accounts', (row) => row.accounts),
  col.count('Bads', (row) => row.bads),
  col.number('Weight', (row) => row.weight),
  col.number('Effective accounts', (row) => row.effectiveAccounts, 18),
  col.rate('Mean PD', (row) => row.meanPd),
  col.rate('Lowest PD', (row) => row.pdMin),
  col.rate('Highest PD', (row) => row.pdMax),
  col.rate('Observed bad rate', (row) => row.observedBadRate, 18),
  ...col.interval<CalibrationRow>('Wilson interval', F.rate, (row) => row.observedBadRateCi),
  col.number('Expected bads', (row) => row.expectedBads, 14),
  col.number('Observed bads', (row) => row.observedBads, 14),
  col.p('Jeffreys p', (row) => row.jeffreysP),
  col.p('Binomial p', (row) => row.binomialP),
  col.text('PD', (row) => (row.fails ? 'too low' : 'not rejected'), 14),
];

export function calibrationSheet(workbook: ExcelJS.Workbook, report: Report): void {
  const calibration = report.calibration;
  if (!calibration || (!calibration.champion && !calibration.challenger)) return;
  const sheet = workbook.addWorksheet('Calibration');
  for (const model of ['champion', 'challenger'] as const) {
    const result = calibration[model];
    if (!result) continue;
    const groups = result.groupedBy.kind === 'grades' ? `grade (${result.groupedBy.column})` : 'quantile band';
    writeFields(
      sheet,
      `${modelName[model]}: calibration by ${groups}; one-sided tests, H0: the PD is not underestimated; "too low" where Jeffreys p < α = ${calibration.alpha}`,
      calibrationFields,
      [...result.rows, result.portfolio],
    );
    facts(sheet, `${modelName[model]}: Brier score and Murphy's decomposition`, [
      ['Brier score', result.brier.brier, F.metric],
      ['Reliability', result.brier.reliability, F.metric],
      ['Resolution', result.brier.resolution, F.metric],
      ['Uncertainty', result.brier.uncertainty, F.metric],
      ['Within groups', result.brier.withinGroup, F.metric],
      ['Groups with the PD too low', result.failing, F.count],
      ['α (calibration)', calibration.alpha, F.number],
      ['Confidence of the Wilson intervals', calibration.confidence, F.share],
      ['Weighted', calibration.weighted ? 'yes' : 'no'],
    ]);
  }
}

function psiBands(sheet: ExcelJS.Worksheet, model: 'champion' | 'challenger', psi: Psi): void {
  writeFields<Psi['bands'][number]>(
    sheet,
    `${modelName[model]}: PSI by reference band`,
    [
      col.text('Band', (band) => band.band),
      col.score('Score from', (band) => band.scoreMin),
      col.score('Score to', (band) => band.scoreMax),
      col.rate('Reference share', (band) => band.referenceShare, 16),
      col.rate('Actual share', (band) => band.actualShare, 14),
      col.metric('Contribution', (band) => band.contribution, 14),
    ],
    psi.bands,
  );
}

export function stabilitySheet(workbook: ExcelJS.Workbook, report: Report): void {
  const stability = report.stability;
  if (!stability || (stability.periods.length === 0 && !stability.psi)) return;
  const sheet = workbook.addWorksheet('Stability');
  if (stability.periods.length > 0) {
    writeFields<PeriodRow>(
      sheet,
      `By ${stability.periodColumn ?? 'period'} (fractions: Gini 0.4213 is 42.13 points); the sign rule counts periods with at least ${stability.minBads} bads`,
      [
        col.text('Period', (row) => row.period, 14),
        col.count('Accounts', (row) => row.accounts),
        col.count('Bads', (row) => row.bads),
        col.metric('Champion Gini', (row) => row.championGini, 15),
        ...col.interval<PeriodRow>('Champion Gini', F.metric, (row) => row.championGiniCi),
        col.metric('Challenger Gini', (row) => row.challengerGini, 15),
        ...col.interval<PeriodRow>('Challenger Gini', F.metric, (row) => row.challengerGiniCi),
        col.metric('ΔGini', (row) => row.deltaGini),
        ...col.interval<PeriodRow>('ΔGini', F.metric, (row) => row.deltaGiniCi),
        col.metric('Champion KS', (row) => row.championKs, 13),
        col.metric('Challenger KS', (row) => row.challengerKs, 14),
        col.metric('Champion PSI vs previous', (row) => row.championPsiFromPrevious, 23),
        col.metric('Challenger PSI vs previous', (row) => row.challengerPsiFromPrevious, 24),
        col.yesNo('Enough bads', (row) => row.enoughBads),
        col.yesNo('Sign changed', (row) => row.signChanged, 13),
        col.text('Note', (row) => row.note, 40),
      ],
      stability.periods,
    );
  }
  const psi = stability.psi;
  if (psi) {
    const reference = psi.reference.kind === 'file' ? `the development sample ${psi.reference.fileName}` : `period ${psi.reference.period}`;
    const side = (model: 'champion' | 'challenger') => psi[model];
    writeFields<'champion' | 'challenger'>(
      sheet,
      `Population stability index against ${reference} (${psi.reference.rows} accounts); compared: ${psi.actual}. Critical value: Yurdakul & Naranjo; 0.1 / 0.25 readings: common practice, no source`,
      [
        col.text('Model', (model) => modelName[model], 14),
        col.metric('PSI', (model) => side(model).psi),
        col.metric('Critical value', (model) => side(model).criticalValue, 14),
        col.number('α', (model) => side(model).criticalAlpha),
        col.number('Reference accounts', (model) => side(model).referenceSize, 18),
        col.number('Compared accounts', (model) => side(model).actualSize, 18),
        col.count('Bands', (model) => side(model).bands.length),
        col.count('Empty bands adjusted', (model) => side(model).emptyBandsAdjusted, 20),
        col.yesNo('Beyond sampling noise', (model) => side(model).significant, 21),
        col.text('Reading', (model) => side(model).rating, 12),
      ],
      ['champion', 'challenger'] as const,
    );
    psiBands(sheet, 'champion', psi.champion);
    psiBands(sheet, 'challenger', psi.challenger);
  }
}
