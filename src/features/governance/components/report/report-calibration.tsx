import { calibrationChart, stabilityChart } from '@shared/pack/calibration-charts';
import { brierFacts, calibratedModels, calibrationTable, calibrationTestsSentence, calibrationTitle, noCalibrationSectionSentence, noCalibrationSentence, psiBandsTable, psiSentence, psiTable, stabilitySignSentence, stabilityTable, stabilityTitle } from '@shared/pack/calibration-words';
import { type Report } from '@shared/report';
import { PackChart } from '@/components/charts/pack-chart';
import { FactList, ReportBlock, ReportTable } from './report-table';

/**
 * The printable report's calibration and stability: the words and tables of the committee pack
 * (shared/pack/calibration-words.ts) with the pack's charts (shared/pack/calibration-charts.ts),
 * laid out as report blocks.
 */
export function ReportCalibrationStability({ report }: { report: Report }) {
  const { calibration, stability } = report;
  if (!calibration && !stability) return <p className="text-sm text-ink-soft">{noCalibrationSectionSentence}</p>;
  const models = calibratedModels(calibration);
  const periodChart = stabilityChart(report);
  const psi = stability?.psi ?? null;
  return (
    <>
      {calibration && models.length === 0 ? <p className="text-sm text-ink-soft">{noCalibrationSentence}</p> : null}
      {models.map((model) => {
        const result = calibration![model]!;
        const chart = calibrationChart(report, model);
        return (
          <ReportBlock key={model} title={calibrationTitle(model, result)} note={calibrationTestsSentence(calibration!, result)}>
            {chart ? <PackChart chart={chart} /> : null}
            <ReportTable caption={`${model === 'champion' ? 'Champion' : 'Challenger'} calibration`} {...calibrationTable(result)} />
            <FactList facts={brierFacts(result.brier)} />
          </ReportBlock>
        );
      })}
      {stability && stability.periods.length > 0 ? (
        <ReportBlock title={stabilityTitle(stability)} note={stabilitySignSentence(stability)}>
          {periodChart ? <PackChart chart={periodChart} /> : null}
          <ReportTable caption="Stability by period" {...stabilityTable(stability)} />
        </ReportBlock>
      ) : null}
      {psi ? (
        <ReportBlock title="Population stability index" note={psiSentence(psi)}>
          <ReportTable caption="Population stability index" {...psiTable(psi)} />
          {(['champion', 'challenger'] as const).map((model) => {
            const { title, ...table } = psiBandsTable(psi, model);
            return <ReportTable key={model} caption={title} {...table} />;
          })}
        </ReportBlock>
      ) : null}
    </>
  );
}
