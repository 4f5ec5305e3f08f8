import { createColumnHelper } from '@tanstack/react-table';
import { type AnalysisRun } from '@shared/comparisons';
import { formatCount, formatDateTime, isoDateTime } from '@/lib/format';
import { DataTable } from '@/components/data-table';
import { StatusBadge } from '@/components/status-badge';
import { runStatusLabels, runStatusTones } from '@/features/comparisons/lib/state-tone';

const column = createColumnHelper<AnalysisRun>();

/** Every analysis run of the comparison, newest first; the current one is marked. */
export function RunsHistory({ runs, currentRunId }: { runs: AnalysisRun[]; currentRunId: number | null }) {
  const columns = [
    column.accessor('id', {
      header: 'Run',
      meta: { rowHeader: true },
      cell: ({ getValue }) => (
        <span className="num">
          #{getValue()}
          {getValue() === currentRunId ? <span className="ml-1.5 text-xs font-normal text-ink-soft">(shown)</span> : null}
        </span>
      ),
    }),
    column.accessor('status', { header: 'Status', cell: ({ getValue }) => <StatusBadge tone={runStatusTones[getValue()]}>{runStatusLabels[getValue()]}</StatusBadge> }),
    column.accessor('queuedAt', { header: 'Queued', cell: ({ getValue }) => <time dateTime={isoDateTime(getValue())}>{formatDateTime(getValue())}</time> }),
    column.accessor('finishedAt', { header: 'Finished', cell: ({ getValue }) => <time dateTime={isoDateTime(getValue())}>{formatDateTime(getValue())}</time> }),
    column.accessor('attempts', { header: 'Attempts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
    column.accessor('engineVersion', { header: 'Engine', cell: ({ getValue }) => getValue() ?? '—' }),
    column.accessor('error', { header: 'Error', cell: ({ getValue }) => <span className="text-bad-strong">{getValue() ?? ''}</span> }),
  ];
  return <DataTable data={runs} columns={columns} caption="Analysis runs, newest first" density="compact" enableSorting={false} getRowId={(run) => String(run.id)} />;
}
