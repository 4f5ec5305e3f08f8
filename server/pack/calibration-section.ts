import { calibrationChart, stabilityChart } from '@shared/pack/calibration-charts';
import { brierFacts, calibratedModels, calibrationTable, calibrationTestsSentence, calibrationTitle, noCalibrationSentence, psiBandsTable, psiSentence, psiTable, stabilitySignSentence, stabilityTable, stabilityTitle } from '@shared/pack/calibration-words';
import type { Block, PackInput, Section } from './sections';

/**
 * The committee pack's calibration and stability section, when the report has them: for each model
 * whose score is confirmed as a probability of default, its calibration by band or grade (mean PD
 * against the observed bad rate with its Wilson interval, the Jeffreys and exact binomial tests,
 * the portfolio row, the Brier score with Murphy's decomposition) and its chart; then stability by
 * period (Gini, KS, ΔGini with its interval, PSI from the previous period) with its chart, and the
 * PSI against the reference with its critical value. The words and tables are
 * shared/pack/calibration-words.ts, which the printable report prints too; this file only lays
 * them out as pack blocks.
 */
export function calibrationStability(input: PackInput): Section | null {
  const { calibration, stability } = input.report;
  const models = calibratedModels(calibration);
  const hasStability = stability !== undefined && (stability.periods.length > 0 || stability.psi !== null);
  if (models.length === 0 && !hasStability) return null;
  const blocks: Block[] = [];

  for (const model of models) {
    const result = calibration![model]!;
    blocks.push(
      { kind: 'subheading', text: calibrationTitle(model, result) },
      { kind: 'paragraph', text: calibrationTestsSentence(calibration!, result) },
      { kind: 'chart', chart: calibrationChart(input.report, model)! },
      { kind: 'table', title: `${model === 'champion' ? 'Champion' : 'Challenger'} calibration`, ...calibrationTable(result) },
      { kind: 'facts', rows: brierFacts(result.brier) },
    );
  }
  if (calibration && models.length === 0) blocks.push({ kind: 'paragraph', muted: true, text: noCalibrationSentence });

  if (stability && stability.periods.length > 0) {
    blocks.push({ kind: 'subheading', text: stabilityTitle(stability) }, { kind: 'paragraph', text: stabilitySignSentence(stability) });
    const chart = stabilityChart(input.report);
    if (chart) blocks.push({ kind: 'chart', chart });
    blocks.push({ kind: 'table', title: 'Stability by period', ...stabilityTable(stability) });
  }

  const psi = stability?.psi;
  if (psi) {
    blocks.push(
      { kind: 'subheading', text: 'Population stability index' },
      { kind: 'paragraph', text: psiSentence(psi) },
      { kind: 'table', title: 'Population stability index', ...psiTable(psi) },
    );
    for (const model of ['champion', 'challenger'] as const) blocks.push({ kind: 'table', ...psiBandsTable(psi, model) });
  }
  return { title: 'Calibration and stability', blocks };
}
