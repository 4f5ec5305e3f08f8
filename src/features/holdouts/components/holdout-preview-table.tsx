import { type ColumnDef, createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { type HoldoutInfo } from '@shared/comparisons';
import { formatCount } from '@/lib/format';
import { DataTable } from '@/components/data-table';

type PreviewRow = { line: number; cells: string[] };
const column = createColumnHelper<PreviewRow>();

const kindWords = { numeric: 'numbers', categorical: 'categories', text: 'text' } as const;

/**
 * The first rows of the file as read (line numbers as in the file, the header being line 1), each
 * column headed by its name, what its values look like, and the role it is mapped to.
 */
export function HoldoutPreviewTable({ holdout, roles }: { holdout: HoldoutInfo; roles: Record<string, string> }) {
  const rows = useMemo(() => holdout.preview.map((cells, index) => ({ line: index + 2, cells })), [holdout.preview]);
  const columns = useMemo(() => {
    // Columns of different value types in one list, as DataTable takes them (`ColumnDef<T, any>`).
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    const list: ColumnDef<PreviewRow, any>[] = [
      column.accessor('line', {
        header: 'Line',
        meta: { numeric: true, rowHeader: true, cellClassName: 'text-ink-soft font-normal' },
        cell: ({ getValue }) => formatCount(getValue()),
      }),
    ];
    holdout.columns.forEach((info, index) => {
      list.push(
        column.accessor((row) => row.cells[index] ?? '', {
          id: `c${index}`,
          header: () => (
            <span className="flex flex-col items-start gap-0.5 text-left">
              <code className="font-mono text-xs font-semibold text-ink">{info.name}</code>
              <span className="font-normal text-ink-soft">
                {kindWords[info.kind]}
                {info.missing > 0 ? `, ${formatCount(info.missing)} empty` : ''}
              </span>
              {roles[info.name] ? (
                <span className="rounded-sm bg-court-50 px-1 py-px text-[0.7rem] font-medium text-court-700 ring-1 ring-court-200">{roles[info.name]}</span>
              ) : null}
            </span>
          ),
          meta: { numeric: info.kind === 'numeric', cellClassName: 'whitespace-nowrap' },
          cell: ({ getValue }) => (getValue() === '' ? <span className="text-ink-faint">empty</span> : getValue()),
        }),
      );
    });
    return list;
  }, [holdout.columns, roles]);

  return (
    <div className="max-h-96 overflow-y-auto rounded-lg">
      <DataTable data={rows} columns={columns} caption={`The first ${rows.length} rows of ${holdout.fileName}`} density="compact" enableSorting={false} />
    </div>
  );
}
