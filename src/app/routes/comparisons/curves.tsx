import { formatAuc, formatGini, formatGiniDelta, formatKsDelta, formatPercent } from '@/lib/format';
import { Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { BootstrapHistogram } from '@/features/curves/components/bootstrap-histogram';
import { KsChart } from '@/features/curves/components/ks-chart';
import { ModelCurveChart } from '@/features/curves/components/model-curve-chart';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** ROC, CAP and KS charts of both models, and the bootstrap distributions of ΔGini and ΔKS. */
export function Component() {
  const { report } = useComparisonPage();
  const { champion, challenger, difference, curves, bootstrap } = report;
  const confidence = formatPercent(report.settings.confidence, 0);
  const diagonal = [
    { x: 0, y: 0 },
    { x: 1, y: 1 },
  ];
  const perfect = [
    { x: 0, y: 0 },
    { x: report.badRate, y: 1 },
    { x: 1, y: 1 },
  ];
  return (
    <div className="space-y-6">
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
        <ModelCurveChart
          title="ROC curve"
          curve={curves.roc}
          references={[{ key: 'reference', points: diagonal }]}
          xLabel="Share of goods declined"
          yLabel="Share of bads declined"
          tableX="Share of goods declined"
          legendDetail={{ champion: `AUC ${formatAuc(champion.auc)}`, challenger: `AUC ${formatAuc(challenger.auc)}` }}
          caption={`Declining accounts from the riskiest score up: the share of bads caught against the share of goods lost. The area under the curve is the AUC: champion ${formatAuc(champion.auc)}, challenger ${formatAuc(challenger.auc)}; the diagonal is a model that cannot separate (AUC 0.5).`}
        />
        <ModelCurveChart
          title="CAP curve (cumulative accuracy profile)"
          curve={curves.cap}
          references={[
            { key: 'reference', points: diagonal },
            { key: 'perfect', points: perfect },
          ]}
          xLabel="Share of all accounts declined"
          yLabel="Share of bads declined"
          tableX="Share of all accounts declined"
          legendDetail={{ champion: `Gini ${formatGini(champion.gini)}`, challenger: `Gini ${formatGini(challenger.gini)}` }}
          caption={`The share of bads caught as the riskiest accounts are declined first. A perfect model catches every bad by declining the ${formatPercent(report.badRate)} that are bad; the accuracy ratio (Gini) is champion ${formatGini(champion.gini)}, challenger ${formatGini(challenger.gini)} points.`}
        />
      </div>
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
        <KsChart model="champion" points={curves.ks.champion} metrics={champion} column={report.mapping.champion} />
        <KsChart model="challenger" points={curves.ks.challenger} metrics={challenger} column={report.mapping.challenger} />
      </div>
      <Section
        title="Bootstrap distributions"
        description={`Paired bootstrap, stratified by outcome: each replicate resamples the same accounts for both models (seed ${bootstrap.seed}). The interval is the ${confidence} percentile interval.`}
      >
        {bootstrap.histograms ? (
          <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
            <BootstrapHistogram
              title="ΔGini across replicates"
              quantity="ΔGini"
              histogram={bootstrap.histograms.deltaGini}
              interval={difference.giniBootstrapCi}
              estimate={difference.gini}
              reference={difference.giniCi ? { label: `DeLong ${confidence} interval`, interval: difference.giniCi } : undefined}
              confidence={confidence}
              format={formatGiniDelta}
            />
            <BootstrapHistogram
              title="ΔKS across replicates"
              quantity="ΔKS"
              histogram={bootstrap.histograms.deltaKs}
              interval={difference.ksCi}
              estimate={difference.ks}
              confidence={confidence}
              format={formatKsDelta}
            />
          </div>
        ) : (
          <Callout tone="info" title="The bootstrap was skipped">
            <p>
              This analysis ran with 0 bootstrap replicates, so there are no KS intervals and no replicate distributions. The DeLong interval of
              ΔGini does not need the bootstrap. Run the analysis again with replicates to see them.
            </p>
          </Callout>
        )}
      </Section>
    </div>
  );
}
