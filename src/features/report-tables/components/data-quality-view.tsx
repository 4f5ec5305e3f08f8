import { createColumnHelper } from '@tanstack/react-table';
import { type ComparisonDetail } from '@shared/comparisons';
import { type Report } from '@shared/report';
import { formatBytes, formatCount, formatDateTime, formatNumber, formatPercent, formatScore } from '@/lib/format';
import { Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { DataTable } from '@/components/data-table';
import { ModelTag } from '@/components/model-tag';
import { Stat, StatGroup } from '@/components/stat';
import { UnknownOutcomesView } from './unknown-outcomes-view';

type Missing = { column: string; role: string; missing: number };
const missingColumn = createColumnHelper<Missing>();
const missingColumns = [
  missingColumn.accessor('column', { header: 'Column', meta: { rowHeader: true }, cell: ({ getValue }) => <code className="font-mono text-xs">{getValue()}</code> }),
  missingColumn.accessor('role', { header: 'Mapped as' }),
  missingColumn.accessor('missing', { header: 'Empty cells', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
];

const orientation = { safer: 'higher is safer', riskier: 'higher is riskier' } as const;

function roleOf(report: Report, name: string): string {
  const { mapping } = report;
  if (name === mapping.outcome) return 'Outcome';
  if (name === mapping.champion) return 'Champion score';
  if (name === mapping.challenger) return 'Challenger score';
  if (name === mapping.id) return 'Account id';
  if (name === mapping.exposure) return 'Exposure';
  if (name === mapping.weight) return 'Sampling weight';
  if (name === mapping.inferredBad) return 'Inferred probability of bad';
  if (mapping.segments?.includes(name)) return 'Segment';
  return '—';
}

/** What the analysis ran on: the file and its hash, rows, bad rate, empty cells, score ranges, settings. */
export function DataQualityView({ report, comparison }: { report: Report; comparison: ComparisonDetail }) {
  const quality = report.dataQuality;
  const missing = Object.entries(quality.missingByColumn).map(([name, count]) => ({ column: name, role: roleOf(report, name), missing: count }));
  const run = comparison.runs.find((candidate) => candidate.id === comparison.currentRunId);
  return (
    <div className="space-y-6">
      {quality.warnings.map((warning) => (
        <Callout key={warning} tone="caution" title="Warning">
          <p>{warning}</p>
        </Callout>
      ))}
      <UnknownOutcomesView report={report} />
      <Section title="The file">
        <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
          <div>
            <dt className="text-xs font-medium text-ink-soft">File name</dt>
            <dd className="font-medium break-all text-ink">{report.input.fileName}</dd>
          </div>
          {report.input.sheet !== undefined ? (
            <div>
              <dt className="text-xs font-medium text-ink-soft">Sheet read</dt>
              <dd className="font-medium break-all text-ink" data-testid="sheet">
                {report.input.sheet}
              </dd>
            </div>
          ) : null}
          <div>
            <dt className="text-xs font-medium text-ink-soft">Size</dt>
            <dd className="num text-ink">{formatBytes(report.input.bytes)}</dd>
          </div>
          <div className="sm:col-span-2">
            <dt className="text-xs font-medium text-ink-soft">SHA-256 of the bytes analysed</dt>
            <dd className="font-mono text-xs break-all text-ink" data-testid="sha256">
              {report.input.sha256}
            </dd>
          </div>
        </dl>
      </Section>
      <Section title="Rows and outcome">
        <StatGroup>
          <Stat label="Rows read" value={formatCount(quality.rowsRead)} />
          <Stat label="Rows used" value={formatCount(quality.rowsUsed)} footnote={quality.rowsDroppedMissingScore > 0 ? `${formatCount(quality.rowsDroppedMissingScore)} left out: empty score` : 'none left out'} />
          <Stat label="Goods" value={formatCount(report.goods)} />
          <Stat label="Bads" value={formatCount(report.bads)} />
          <Stat label="Bad rate" value={formatPercent(report.badRate, 2)} />
          <Stat label="Duplicate ids" value={quality.duplicateIds === null ? '—' : formatCount(quality.duplicateIds)} footnote={quality.duplicateIds === null ? 'no id column mapped' : undefined} />
        </StatGroup>
      </Section>
      <Section title="Scores">
        <div className="grid gap-4 md:grid-cols-2">
          {(['champion', 'challenger'] as const).map((model) => {
            const summary = quality[model];
            return (
              <div key={model} className="space-y-2">
                <p className="flex flex-wrap items-center gap-2 text-sm">
                  <ModelTag model={model} column={report.mapping[model]} />
                  <span className="text-xs text-ink-soft">({orientation[report[model].higherIs]})</span>
                </p>
                <StatGroup className="grid-cols-2 sm:grid-cols-4 md:grid-cols-2 xl:grid-cols-4">
                  <Stat label="Lowest" value={formatScore(summary.min)} />
                  <Stat label="Highest" value={formatScore(summary.max)} />
                  <Stat label="Mean" value={formatScore(Number(summary.mean.toPrecision(6)))} />
                  <Stat label="Distinct values" value={formatCount(summary.distinct)} />
                </StatGroup>
              </div>
            );
          })}
        </div>
        <p className="mt-4 text-sm text-ink-soft">
          Correlation of the two scores as given (each in its own orientation): Pearson{' '}
          <span className="num font-medium text-ink">{formatNumber(quality.scoreCorrelation.pearson, 3)}</span>, Spearman{' '}
          <span className="num font-medium text-ink">{formatNumber(quality.scoreCorrelation.spearman, 3)}</span>. Two models that rank accounts
          alike swap few of them.
        </p>
      </Section>
      <Section title="Empty cells in the mapped columns">
        <DataTable data={missing} columns={missingColumns} caption="Empty cells per mapped column" density="compact" enableSorting={false} />
      </Section>
      <Section title="Settings of this run" description="With the file's SHA-256 these reproduce every number.">
        <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2 lg:grid-cols-4">
          {[
            ['Bootstrap replicates', formatCount(report.settings.bootstrap)],
            ['Random seed', String(report.settings.seed)],
            ['Confidence', formatPercent(report.settings.confidence, 0)],
            ['Approval rate', formatPercent(report.settings.approvalRate, 1)],
            ['Cut-offs', report.settings.cutoffs ? `${formatScore(report.settings.cutoffs.champion)} / ${formatScore(report.settings.cutoffs.challenger)}` : 'matched to the approval rate'],
            ['Bands', formatCount(report.settings.bands)],
            ['Rows with an empty score', report.settings.dropMissing ? 'left out' : 'an error'],
            ['Engine version', report.engineVersion],
            ['Adoption policy', `version ${report.policy.version}`],
            ['Bad value', `${report.mapping.outcome} = ${report.mapping.badValue}`],
            ['Run', run ? `#${run.id}, ${run.finishedAt ? formatDateTime(run.finishedAt) : '—'}` : '—'],
          ].map(([label, value]) => (
            <div key={label}>
              <dt className="text-xs font-medium text-ink-soft">{label}</dt>
              <dd className="num text-ink">{value}</dd>
            </div>
          ))}
        </dl>
      </Section>
    </div>
  );
}
