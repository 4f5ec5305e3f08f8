import { hasSeveralChallengers } from '@shared/challengers-words';
import { bandsOf } from '@shared/challenger-sections';
import { hasUnknownOrWeights } from '@shared/population';
import { paths } from '@/config/paths';
import { formatCount } from '@/lib/format';
import { Section } from '@/components/card';
import { ModelTag } from '@/components/model-tag';
import { BandTable } from '@/features/report-tables/components/band-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/**
 * Gains tables of both models: equal-count bands from the riskiest. With several challengers, the
 * champion's and then each challenger's, each with its own download beside the champion's.
 */
export function Component() {
  const { comparison, report } = useComparisonPage();
  const population = hasUnknownOrWeights(report);
  if (hasSeveralChallengers(report)) {
    return (
      <div className="space-y-6">
        <p className="max-w-3xl text-sm text-ink-soft">
          Each model’s accounts in {formatCount(report.settings.bands)} bands of about equal size, band 1 the riskiest, with cumulative shares of bads and goods and the KS at
          the end of each band. Each download holds the champion’s table and one challenger’s.
        </p>
        <Section title={<ModelTag model="champion" column={report.mapping.champion} className="text-sm" />}>
          <BandTable table={report.bands.champion} title="Champion gains table" gini={report.champion.gini} population={population} />
        </Section>
        {report.challengers.map((challenger, index) => {
          const table = bandsOf(report, index);
          return (
            <Section key={challenger.column} title={`${challenger.name} (challenger ${index + 1})`}>
              <p className="mb-3 text-sm">
                <a href={paths.exports.bandsCsv(comparison.id, index)} download className="font-medium break-words text-court-700 underline" data-testid="bands-csv">
                  Download with the champion’s (bands{index === 0 ? '' : `-challenger-${index}`}.csv)
                </a>
              </p>
              {table ? (
                <BandTable table={table} title={`${challenger.name} gains table`} gini={challenger.metrics.gini} population={population} />
              ) : (
                <p className="text-sm text-ink-soft">This report has no band table for {challenger.name}; the download computes it from the run, or run the analysis again.</p>
              )}
            </Section>
          );
        })}
      </div>
    );
  }
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
          <BandTable table={report.bands[model]} title={`${model === 'champion' ? 'Champion' : 'Challenger'} gains table`} gini={report[model].gini} population={population} />
        </Section>
      ))}
    </div>
  );
}
