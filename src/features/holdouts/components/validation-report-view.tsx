import { createColumnHelper } from '@tanstack/react-table';
import { type ValidationReport } from '@shared/comparisons';
import { formatCount, formatPercent } from '@/lib/format';
import { Callout } from '@/components/callout';
import { DataTable } from '@/components/data-table';
import { Stat, StatGroup } from '@/components/stat';
import { RowErrorsTable } from '@/features/holdouts/components/row-errors-table';

type Missing = { column: string; missing: number };
const column = createColumnHelper<Missing>();
const missingColumns = [
  column.accessor('column', { header: 'Column', meta: { rowHeader: true }, cell: ({ getValue }) => <code className="font-mono text-xs">{getValue()}</code> }),
  column.accessor('missing', { header: 'Empty cells', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
];

/** Step 4: the problems by row and column, or what the analysis will run on. */
export function ValidationReportView({ report }: { report: ValidationReport }) {
  if (!report.ok || !report.summary) {
    return (
      <div className="space-y-4">
        <Callout tone="error" title={`The data do not fit this mapping: ${formatCount(report.errors.length)} ${report.errors.length === 1 ? 'problem' : 'problems'} found`} live>
          <p>
            Each problem names its line in the file (the header is line 1) and its column.
            {report.errors.length >= 50 ? ' Only the first 50 are listed.' : ''} Fix the file and upload it again, or change the mapping.
          </p>
        </Callout>
        <RowErrorsTable errors={report.errors} caption="Problems found with this mapping" />
      </div>
    );
  }
  const { summary } = report;
  const missing = Object.entries(summary.missingByColumn).map(([name, count]) => ({ column: name, missing: count }));
  const anyMissing = missing.some((row) => row.missing > 0);
  return (
    <div className="space-y-5">
      <Callout tone="success" title="Every row fits the mapping" live>
        <p>
          {summary.accounts === undefined
            ? `The analysis will run on ${formatCount(summary.rowsUsed)} accounts.`
            : `The analysis will run on ${formatCount(summary.rowsUsed)} rows standing for ${formatCount(Math.round(summary.accounts))} applicants${
                summary.unknownRows ? `; ${formatCount(summary.unknownRows)} rows have no outcome` : ''
              }.`}
        </p>
      </Callout>
      <StatGroup>
        <Stat label="Rows in the file" value={formatCount(summary.rows)} />
        <Stat label="Rows used" value={formatCount(summary.rowsUsed)} footnote={summary.rowsDroppedMissingScore > 0 ? `${formatCount(summary.rowsDroppedMissingScore)} left out: empty score` : 'none left out'} />
        {summary.accounts !== undefined ? <Stat label="Applicants" value={formatCount(Math.round(summary.accounts))} footnote="the rows' weights summed" /> : null}
        {summary.unknownRows !== undefined ? <Stat label="Rows without an outcome" value={formatCount(summary.unknownRows)} footnote="in approval rates and swap sets, not in AUC or bad rates" /> : null}
        <Stat label="Goods" value={formatCount(summary.goods)} footnote={summary.accounts !== undefined ? 'rows with an outcome' : undefined} />
        <Stat label="Bads" value={formatCount(summary.bads)} footnote={summary.bads < 300 ? 'fewer than 300: intervals will be wide' : undefined} />
        <Stat label={summary.accounts !== undefined ? 'Bad rate of the rows' : 'Bad rate'} value={formatPercent(summary.badRate)} footnote={summary.accounts !== undefined ? 'unweighted; the report gives the weighted rate' : undefined} />
      </StatGroup>
      {summary.warnings.map((warning) => (
        <Callout key={warning} tone="caution" title="Warning">
          <p>{warning}</p>
        </Callout>
      ))}
      <div className="space-y-2">
        <h3 className="text-sm font-semibold text-ink">Empty cells in the mapped columns</h3>
        {anyMissing ? (
          <DataTable data={missing} columns={missingColumns} caption="Empty cells per mapped column" density="compact" />
        ) : (
          <p className="text-sm text-ink-soft">None: every mapped column is filled on every row.</p>
        )}
      </div>
    </div>
  );
}
