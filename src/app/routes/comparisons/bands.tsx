import { paths } from '@/config/paths';
import { formatCount } from '@/lib/format';
import { Section } from '@/components/card';
import { ModelTag } from '@/components/model-tag';
import { BandTable } from '@/features/report-tables/components/band-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** Gains tables of both models: equal-count bands from the riskiest. */
export function Component() {
  const { comparison, report } = useComparisonPage();
  return (
    <div className="space-y-6">
      <p className="max-w-3xl text-sm text-ink-soft">
        Each model’s accounts in {formatCount(report.settings.bands)} bands of about equal size, band 1 the riskiest, with cumulative shares of
        bads and goods and the KS at the end of each band.{' '}
        <a href={paths.exports.bandsCsv(comparison.id)} download className="font-medium text-court-700 underline">
          Download both tables (bands.csv)
        </a>
      </p>
      {(['champion', 'challenger'] as const).map((model) => (
        <Section key={model} title={<ModelTag model={model} column={report.mapping[model]} className="text-sm" />}>
          <BandTable table={report.bands[model]} title={`${model === 'champion' ? 'Champion' : 'Challenger'} gains table`} gini={report[model].gini} />
        </Section>
      ))}
    </div>
  );
}
