import { type Report } from '@shared/report';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatKs, formatNumber, formatPercent, formatPValue } from '@/lib/format';
import { ReportBlock, ReportTable } from './report-table';

const pct2 = (value: number) => formatPercent(value, 2);

/** The printable report's calibration and stability: the same tables as the tabs, without charts. */
export function ReportCalibrationStability({ report }: { report: Report }) {
  const { calibration, stability } = report;
  if (!calibration && !stability) return <p className="text-sm text-ink-soft">This report was made before calibration and stability were computed.</p>;
  const models = (['champion', 'challenger'] as const).filter((model) => calibration?.[model]);
  return (
    <>
      {calibration && models.length === 0 ? <p className="text-sm text-ink-soft">Neither score is marked as a probability of default: no calibration.</p> : null}
      {models.map((model) => {
        const result = calibration![model]!;
        const name = model === 'champion' ? 'Champion' : 'Challenger';
        return (
          <ReportBlock
            key={model}
            title={`${name}: calibration by ${result.groupedBy.kind === 'grades' ? `grade (${result.groupedBy.column})` : 'quantile band'}`}
            note={`Jeffreys test (ECB 2019 instructions for IRB validation reporting) and exact binomial test, one-sided, H0: the PD is not underestimated; groups with Jeffreys p below α = ${formatNumber(calibration!.alpha, 2)} are marked. Brier ${formatNumber(result.brier.brier, 5)}: reliability ${formatNumber(result.brier.reliability, 5)}, resolution ${formatNumber(result.brier.resolution, 5)}, uncertainty ${formatNumber(result.brier.uncertainty, 5)} (Murphy 1973).`}
          >
            <ReportTable
              caption={`${name} calibration`}
              head={['Group', 'Accounts', 'Mean PD', 'Bad rate', 'Wilson interval', 'Expected bads', 'Observed bads', 'Jeffreys p', 'Binomial p', 'PD']}
              numeric={[1, 2, 3, 4, 5, 6, 7, 8]}
              rows={[...result.rows, result.portfolio].map((row) => [
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
              ])}
            />
          </ReportBlock>
        );
      })}
      {stability && stability.periods.length > 0 ? (
        <ReportBlock
          title={`Stability by ${stability.periodColumn}`}
          note={
            stability.signChanges.length > 0
              ? `The uplift changes sign in ${stability.signChanges.join(', ')} (periods with at least ${formatCount(stability.minBads)} bads).`
              : `The uplift keeps its sign in every period with at least ${formatCount(stability.minBads)} bads.`
          }
        >
          <ReportTable
            caption="Stability by period"
            head={['Period', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', 'ΔGini interval', 'KS champion / challenger', 'PSI vs previous', 'Note']}
            numeric={[1, 2, 3, 4, 5, 6, 7, 8]}
            rows={stability.periods.map((row) => [
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
            ])}
          />
        </ReportBlock>
      ) : null}
      {stability?.psi ? (
        <ReportBlock
          title="Population stability index"
          note={`Against ${stability.psi.reference.kind === 'file' ? `the development sample ${stability.psi.reference.fileName}` : `period ${stability.psi.reference.period}`} (${formatCount(stability.psi.reference.rows)} accounts), compared: ${stability.psi.actual}. Critical value: Yurdakul & Naranjo; 0.1 / 0.25: common practice, no source.`}
        >
          <ReportTable
            caption="Population stability index"
            head={['Model', 'PSI', 'Critical value', 'α', 'Bands', 'Reading']}
            numeric={[1, 2, 3, 4]}
            rows={(['champion', 'challenger'] as const).map((model) => {
              const value = stability.psi![model];
              return [
                model === 'champion' ? 'Champion' : 'Challenger',
                formatNumber(value.psi, 4),
                formatNumber(value.criticalValue, 4),
                formatNumber(value.criticalAlpha, 2),
                formatCount(value.bands.length),
                `${value.rating}; ${value.significant ? 'shift beyond sampling noise' : 'no significant shift'}`,
              ];
            })}
          />
        </ReportBlock>
      ) : null}
    </>
  );
}
