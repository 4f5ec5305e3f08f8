import { createColumnHelper } from '@tanstack/react-table';
import { type RowError } from '@shared/comparisons';
import { formatCount } from '@/lib/format';
import { DataTable } from '@/components/data-table';

const column = createColumnHelper<RowError>();
const columns = [
  column.accessor('row', {
    header: 'Line',
    meta: { numeric: true, rowHeader: true, cellClassName: 'w-20' },
    cell: ({ getValue }) => (getValue() === null ? <span className="text-ink-soft">whole file</span> : formatCount(getValue())),
  }),
  column.accessor('column', {
    header: 'Column',
    meta: { cellClassName: 'w-48' },
    cell: ({ getValue }) => (getValue() ? <code className="font-mono text-xs">{getValue()}</code> : <span className="text-ink-soft">—</span>),
  }),
  column.accessor('message', { header: 'Problem' }),
];

/** Problems in a holdout file, each with its line (the header is line 1) and column. */
export function RowErrorsTable({ errors, caption = 'Problems found in the file' }: { errors: RowError[]; caption?: string }) {
  return (
    <DataTable
      data={errors}
      columns={columns}
      caption={caption}
      density="compact"
      getRowId={(error, index) => `${index}-${error.row}-${error.column}`}
      pagination={errors.length > 25 ? { pageSize: 25 } : undefined}
    />
  );
}
