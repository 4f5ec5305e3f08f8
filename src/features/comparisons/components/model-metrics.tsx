import { type Report } from '@shared/report';
import {
  formatAuc,
  formatAucDelta,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatKsDelta,
  formatPercent,
  formatPValue,
  formatScore,
  formatSignedNumber,
} from '@/lib/format';
import { ModelTag } from '@/components/model-tag';
import { Stat, StatGroup } from '@/components/stat';

const orientation = { safer: 'higher is safer', riskier: 'higher is riskier' } as const;

/** Each model's AUC, Gini and KS with their intervals, and the differences with the DeLong test. */
export function ModelMetrics({ report }: { report: Report }) {
  const confidence = formatPercent(report.settings.confidence, 0);
  const boot = report.bootstrap.replicates > 0;
  const model = (name: 'champion' | 'challenger') => {
    const metrics = report[name];
    return (
      <section aria-label={name === 'champion' ? 'Champion' : 'Challenger'} className="space-y-2">
        <div className="flex flex-wrap items-center gap-x-2">
          <ModelTag model={name} column={report.mapping[name]} className="text-sm" />
          <span className="text-xs text-ink-soft">({orientation[metrics.higherIs]})</span>
        </div>
        <StatGroup className="grid-cols-1 sm:grid-cols-3 lg:grid-cols-1 xl:grid-cols-3">
          <Stat label="Gini" value={formatGini(metrics.gini)} unit="points" interval={formatInterval(metrics.giniCi)} intervalLabel={`${confidence} DeLong`} />
          <Stat label="AUC" value={formatAuc(metrics.auc)} interval={formatInterval(metrics.aucCi, formatAuc)} intervalLabel={`${confidence} DeLong`} />
          <Stat
            label="KS"
            value={formatKs(metrics.ks)}
            unit="points"
            interval={metrics.ksCi ? formatInterval(metrics.ksCi, formatKs) : 'no bootstrap'}
            intervalLabel={metrics.ksCi ? `${confidence} bootstrap` : undefined}
            footnote={`largest gap at score ${formatScore(metrics.ksScore)}`}
          />
        </StatGroup>
      </section>
    );
  };
  const { difference } = report;
  return (
    <div className="space-y-6">
      <div className="grid gap-6 lg:grid-cols-2">
        {model('champion')}
        {model('challenger')}
      </div>
      <section aria-label="Differences, challenger minus champion" className="space-y-2">
        <h3 className="text-sm font-semibold text-ink">Differences, challenger − champion</h3>
        <StatGroup>
          <Stat label="ΔGini" value={formatGiniDelta(difference.gini)} unit="points" interval={formatInterval(difference.giniCi, formatGiniDelta)} intervalLabel={`${confidence} DeLong`} footnote={difference.giniBootstrapCi ? `bootstrap ${formatInterval(difference.giniBootstrapCi, formatGiniDelta)}` : undefined} />
          <Stat label="ΔAUC" value={formatAucDelta(difference.auc)} interval={formatInterval(difference.aucCi, formatAucDelta)} intervalLabel={`${confidence} DeLong`} />
          <Stat label="ΔKS" value={formatKsDelta(difference.ks)} unit="points" interval={difference.ksCi ? formatInterval(difference.ksCi, formatKsDelta) : 'no bootstrap'} intervalLabel={boot ? `${confidence} bootstrap` : undefined} />
          <Stat label="DeLong z" value={formatSignedNumber(difference.z)} footnote={`standard error of ΔGini ${formatGini(difference.giniSe)} points`} />
          <Stat label="p, one-sided" value={formatPValue(difference.pOneSided)} footnote="H₁: the challenger's AUC is higher" />
          <Stat label="p, two-sided" value={formatPValue(difference.pTwoSided)} footnote="H₁: the AUCs differ" />
        </StatGroup>
        <p className="text-xs text-ink-soft">
          DeLong, DeLong &amp; Clarke-Pearson (1988), paired on the same accounts; correlation of the two AUC estimates{' '}
          {difference.correlation === null ? '—' : formatSignedNumber(difference.correlation, 2)}. Gini = 2 · AUC − 1.
        </p>
      </section>
    </div>
  );
}
