import { Section } from '@/components/card';
import { EmptyState } from '@/components/empty-state';
import { ModelTag } from '@/components/model-tag';
import { formatCount } from '@/lib/format';
import { DeltaGiniByPeriodChart, GiniByPeriodChart } from '@/features/calibration/components/stability-chart';
import { PsiTable } from '@/features/calibration/components/psi-table';
import { StabilityTable } from '@/features/calibration/components/stability-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** Is the holdout, and the uplift, stable: by period, and against the development sample? */
export function Component() {
  const { report } = useComparisonPage();
  const stability = report.stability;
  if (!stability) {
    return <EmptyState title="No stability for this comparison">This report was made before stability was computed. Run the analysis again to see it.</EmptyState>;
  }
  const { periods, psi } = stability;
  return (
    <div className="space-y-6">
      {stability.periodColumn === null ? (
        <EmptyState title="No period column">Map a month or vintage column in the set-up to follow both models and the uplift over time.</EmptyState>
      ) : (
        <Section
          title={`By ${stability.periodColumn}`}
          description={`Each period on its own accounts: both Ginis and ΔGini with DeLong intervals, KS, and each model's PSI against the previous period. A period counts for the sign rule with at least ${formatCount(stability.minBads)} bads (the adoption policy's figure).`}
        >
          <div className="space-y-4">
            <DeltaGiniByPeriodChart periods={periods} column={stability.periodColumn} minBads={stability.minBads} />
            <GiniByPeriodChart periods={periods} column={stability.periodColumn} />
            <StabilityTable periods={periods} />
          </div>
        </Section>
      )}
      {psi === null ? (
        <EmptyState title="No reference sample">
          Choose the development sample (a second uploaded file with the same score columns) or one period of the holdout as the reference in the set-up
          to see the population stability index.
        </EmptyState>
      ) : (
        <Section
          title="Population stability index"
          description={`PSI = Σ (a − e) ln(a / e) over the reference's bands: ${
            psi.reference.kind === 'file' ? `the development sample ${psi.reference.fileName}` : `period ${psi.reference.period}`
          } (${formatCount(psi.reference.rows)} accounts) against ${psi.actual}.`}
        >
          <div className="space-y-6">
            {(['champion', 'challenger'] as const).map((model) => (
              <div key={model} className="space-y-2">
                <ModelTag model={model} column={report.mapping[model]} className="text-sm" />
                <PsiTable psi={psi[model]} title={`${model === 'champion' ? 'Champion' : 'Challenger'}: PSI by reference band`} />
              </div>
            ))}
          </div>
        </Section>
      )}
    </div>
  );
}
