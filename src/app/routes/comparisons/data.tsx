import { Section } from '@/components/card';
import { RunsHistory } from '@/features/comparisons/components/runs-history';
import { DataQualityView } from '@/features/report-tables/components/data-quality-view';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** The data behind the numbers: file, hash, rows, bad rate, empty cells, scores, settings, runs. */
export function Component() {
  const { comparison, report } = useComparisonPage();
  return (
    <div className="space-y-6">
      <DataQualityView report={report} comparison={comparison} />
      <Section title="Analysis runs" description="Every run is kept; the pages show the newest finished one.">
        <RunsHistory runs={comparison.runs} currentRunId={comparison.currentRunId} />
      </Section>
    </div>
  );
}
