import { createColumnHelper } from '@tanstack/react-table';
import { type ReactNode, useMemo } from 'react';
import { Link } from 'react-router';
import { type ComparisonSummary } from '@shared/comparisons';
import { paths } from '@/config/paths';
import { formatCount, formatDate, formatDateTime, formatGini, formatGiniDelta, formatInterval, formatPValue, isoDateTime } from '@/lib/format';
import { DataTable } from '@/components/data-table';
import { StatusBadge } from '@/components/status-badge';
import { runNote, stateLabel, stateTones, verdictLabels, verdictTones } from '@/features/comparisons/lib/state-tone';
import { choiceLines } from '@/features/comparisons/lib/list-choice';

const column = createColumnHelper<ComparisonSummary>();


type ComparisonsTableProps = {
  items: ComparisonSummary[];
  total: number;
  /** 0-based page shown. */
  pageIndex: number;
  pageSize: number;
  onPageChange: (pageIndex: number) => void;
  empty: ReactNode;
};

/** The comparisons, one server page at a time: state, both Ginis, the uplift with its interval, p. */
export function ComparisonsTable({ items, total, pageIndex, pageSize, onPageChange, empty }: ComparisonsTableProps) {
  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Comparison',
        meta: { rowHeader: true, cellClassName: 'min-w-48' },
        cell: ({ row, getValue }) => (
          <div className="space-y-0.5">
            <Link
              to={paths.comparisons.detail(row.original.id)}
              className="font-medium text-court-700 underline decoration-court-200 underline-offset-2 hover:decoration-court-700 focus-visible:outline-2 focus-visible:outline-court-500"
            >
              {getValue()}
            </Link>
            <p className="text-xs font-normal text-ink-soft">
              {row.original.holdout.fileName} · <span className="num">{formatCount(row.original.holdout.rowCount)}</span> rows
            </p>
          </div>
        ),
      }),
      column.accessor('state', {
        header: 'State',
        cell: ({ row, getValue }) => {
          const note = runNote(row.original);
          return (
            <div className="flex flex-col items-start gap-1">
              <StatusBadge tone={stateTones[getValue()]}>{stateLabel(getValue())}</StatusBadge>
              {note ? <StatusBadge tone={note.tone}>{note.text}</StatusBadge> : null}
            </div>
          );
        },
      }),
      column.display({
        id: 'championGini',
        header: () => (
          <>
            Champion <abbr title="Gini coefficient in points">Gini</abbr>
          </>
        ),
        meta: { numeric: true },
        cell: ({ row }) => formatGini(row.original.headline?.championGini),
      }),
      column.display({
        id: 'challengerGini',
        header: () => (
          <>
            Challenger <abbr title="Gini coefficient in points">Gini</abbr>
          </>
        ),
        meta: { numeric: true },
        cell: ({ row }) => formatGini(row.original.headline?.challengerGini),
      }),
      column.display({
        id: 'uplift',
        header: 'Uplift (ΔGini, interval)',
        meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
        cell: ({ row }) => {
          const headline = row.original.headline;
          if (!headline) return '—';
          return (
            <div className="space-y-0.5">
              <p className="font-medium">{formatGiniDelta(headline.deltaGini)}</p>
              <p className="text-xs text-ink-soft">{formatInterval(headline.deltaGiniCi)}</p>
            </div>
          );
        },
      }),
      column.display({
        id: 'p',
        header: 'p (one-sided)',
        meta: { numeric: true, cellClassName: 'whitespace-nowrap' },
        cell: ({ row }) => formatPValue(row.original.headline?.pOneSided),
      }),
      column.display({
        id: 'verdict',
        header: 'Verdict',
        cell: ({ row }) => {
          const verdict = row.original.verdict?.outcome ?? row.original.headline?.verdict;
          const badge = verdict ? <StatusBadge tone={verdictTones[verdict]}>{verdictLabels[verdict]}</StatusBadge> : <span className="text-ink-faint">—</span>;
          const choice = choiceLines(row.original);
          if (choice.length === 0) return badge;
          return (
            <div className="space-y-0.5">
              {badge}
              {choice.map((line) => (
                <p key={line} className="text-xs text-ink-soft" data-testid="list-choice">
                  {line}
                </p>
              ))}
            </div>
          );
        },
      }),
      column.accessor('createdAt', {
        header: 'Created',
        meta: { cellClassName: 'whitespace-nowrap' },
        cell: ({ row, getValue }) => (
          <div className="space-y-0.5">
            <p>{row.original.createdBy.name}</p>
            <time className="text-xs text-ink-soft" dateTime={isoDateTime(getValue())} title={formatDateTime(getValue())}>
              {formatDate(getValue())}
            </time>
          </div>
        ),
      }),
    ],
    [],
  );

  return (
    <DataTable
      data={items}
      columns={columns}
      caption="Comparisons"
      getRowId={(item) => String(item.id)}
      pagination={{ pageIndex, pageSize, total, onPageChange }}
      empty={empty}
    />
  );
}
