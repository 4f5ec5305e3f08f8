import { formatNumber, formatPercent, formatPValue } from '@/lib/format';
import { Section } from '@/components/card';
import { EmptyState } from '@/components/empty-state';
import { ModelTag } from '@/components/model-tag';
import { CalibrationChart } from '@/features/calibration/components/calibration-chart';
import { CalibrationTable } from '@/features/calibration/components/calibration-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** Are a PD model's probabilities right? Observed against predicted per band or grade, with the Jeffreys and binomial tests. */
export function Component() {
  const { report } = useComparisonPage();
  const calibration = report.calibration;
  const models = (['champion', 'challenger'] as const).filter((model) => calibration?.[model]);
  if (!calibration || models.length === 0) {
    return (
      <EmptyState title="No calibration for this comparison">
        {calibration
          ? 'Calibration is computed for a score that is a probability of default. Mark it so in the column mapping (set-up) and run the analysis again.'
          : 'This report was made before calibration was computed. Run the analysis again to see it.'}
      </EmptyState>
    );
  }
  return (
    <div className="space-y-6">
      <p className="max-w-3xl text-sm text-ink-soft">
        For each band or grade: the mean probability of default (PD) against the observed bad rate with its Wilson interval. The Jeffreys test (as the
        European Central Bank's instructions for reporting IRB validation results, 2019, describe it) asks whether the defaults are too many for the PD:
        p = F<sub>Beta</sub>(PD; D + ½, N − D + ½), one-sided, H0: the PD is not underestimated. The exact binomial test is a second view. A group
        below α = {formatNumber(calibration.alpha, 2)} is marked. {calibration.weighted ? 'Weighted: tests use the effective number of accounts.' : ''}
      </p>
      {models.map((model) => {
        const result = calibration[model]!;
        const { portfolio, brier } = result;
        return (
          <Section key={model} title={<ModelTag model={model} column={report.mapping[model]} className="text-sm" />}>
            <div className="space-y-4">
              <p className="text-sm text-ink-soft">
                Portfolio: {formatNumber(portfolio.expectedBads, 0)} bads expected from the PDs, {formatNumber(portfolio.observedBads, 0)} observed (mean PD{' '}
                {formatPercent(portfolio.meanPd, 2)}, bad rate {formatPercent(portfolio.observedBadRate, 2)}); Jeffreys {formatPValue(portfolio.jeffreysP)},
                binomial {formatPValue(portfolio.binomialP)}. {result.failing > 0 ? `${result.failing} of ${result.rows.length} groups fail on their own.` : ''}
              </p>
              <CalibrationChart model={model} calibration={result} alpha={calibration.alpha} />
              <CalibrationTable calibration={result} />
              <p className="text-sm text-ink-soft">
                Brier score <span className="num font-medium text-ink">{formatNumber(brier.brier, 5)}</span> = reliability {formatNumber(brier.reliability, 5)} −
                resolution {formatNumber(brier.resolution, 5)} + uncertainty {formatNumber(brier.uncertainty, 5)}
                {Math.abs(brier.withinGroup) > 5e-6 ? ` ${brier.withinGroup < 0 ? '−' : '+'} ${formatNumber(Math.abs(brier.withinGroup), 5)} from the PDs' spread within groups` : ''} (Murphy 1973). Lower
                reliability is better calibration; higher resolution, better separation.
              </p>
            </div>
          </Section>
        );
      })}
    </div>
  );
}
