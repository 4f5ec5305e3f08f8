import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { type Scenario } from '@shared/comparisons';
import { formatDate, formatPercent, formatScore, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { DataTable } from '@/components/data-table';
import { EmptyState } from '@/components/empty-state';
import { scenarioAccounts, scenarioBadRate } from '../lib/scenario-cell';

const column = createColumnHelper<Scenario>();

/** The saved scenarios with their swap-in and swap-out at save time; "Show" puts one on the page. */
export function ScenariosTable({ scenarios, onShow, canSave }: { scenarios: Scenario[]; onShow: (scenario: Scenario) => void; canSave: boolean }) {
  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'Scenario', meta: { rowHeader: true } }),
      column.display({
        id: 'settings',
        header: 'Settings',
        cell: ({ row }) => (
          <span className="num text-sm">
            {row.original.approvalRate !== null ? `${formatPercent(row.original.approvalRate)} approval · ` : ''}
            cut-offs {formatScore(row.original.cutoffs.champion)} / {formatScore(row.original.cutoffs.challenger)}
          </span>
        ),
      }),
      column.display({
        id: 'swapIn',
        header: 'Swap-in',
        meta: { numeric: true },
        cell: ({ row }) => `${scenarioAccounts(row.original.swapIn)} at ${scenarioBadRate(row.original.swapIn)}`,
      }),
      column.display({
        id: 'swapOut',
        header: 'Swap-out',
        meta: { numeric: true },
        cell: ({ row }) => `${scenarioAccounts(row.original.swapOut)} at ${scenarioBadRate(row.original.swapOut)}`,
      }),
      column.accessor('note', { header: 'Note', cell: ({ getValue }) => <span className="line-clamp-3 max-w-sm text-ink-soft">{getValue()}</span> }),
      column.accessor('createdAt', {
        header: 'Saved',
        cell: ({ row, getValue }) => (
          <span className="whitespace-nowrap">
            {row.original.createdBy.name}, <time dateTime={isoDateTime(getValue())}>{formatDate(getValue())}</time>
            {row.original.afterDecision ? (
              <span className="ml-1 text-xs font-medium text-caution-strong" data-testid="after-decision">
                · after the decision
              </span>
            ) : null}
          </span>
        ),
      }),
      column.display({
        id: 'show',
        header: () => <span className="sr-only">Actions</span>,
        cell: ({ row }) => (
          <Button size="sm" onClick={() => onShow(row.original)} aria-label={`Show scenario ${row.original.name}`}>
            Show
          </Button>
        ),
      }),
    ],
    [onShow],
  );
  return (
    <DataTable
      data={scenarios}
      columns={columns}
      caption="Saved scenarios"
      density="compact"
      getRowId={(scenario) => String(scenario.id)}
      empty={
        <EmptyState title="No saved scenarios">
          {canSave ? 'Set the cut-offs or approval rate above and save them with a note.' : 'The credit policy role saves the cut-offs it would run here.'}
        </EmptyState>
      }
    />
  );
}
