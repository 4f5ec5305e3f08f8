import {
  type ColumnDef,
  type RowData,
  type SortingState,
  flexRender,
  getCoreRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
} from '@tanstack/react-table';
import { type ReactNode, useState } from 'react';
import { cn } from '@/lib/cn';
import { formatCount } from '@/lib/format';
import { Button } from '@/components/button';
import { EmptyState } from '@/components/empty-state';
import { ChevronLeftIcon, ChevronRightIcon, SortAscendingIcon, SortDescendingIcon, SortIcon } from '@/components/icons';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Right-aligned with tabular figures: counts, rates, metrics. */
    numeric?: boolean;
    /** This column's cell names the row (rendered as <th scope="row">). */
    rowHeader?: boolean;
    headerClassName?: string;
    cellClassName?: string;
  }
}

/** Server-side paging: the table shows one page the server sent and asks for others. */
export interface ManualPagination {
  pageIndex: number;
  pageSize: number;
  total: number;
  onPageChange: (pageIndex: number) => void;
}

type DataTableProps<T> = {
  data: T[];
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  columns: ColumnDef<T, any>[];
  /** Names the table for screen readers; shown above it when `showCaption`. */
  caption: string;
  showCaption?: boolean;
  getRowId?: (row: T, index: number) => string;
  initialSorting?: SortingState;
  /** Sorting by clicking headers; off by default for server-paged tables (it would sort one page). */
  enableSorting?: boolean;
  /** Client-side pages of this size; or a ManualPagination for server-side paging. */
  pagination?: { pageSize: number } | ManualPagination;
  /** Shown instead of the table when there are no rows. */
  empty?: ReactNode;
  density?: 'compact' | 'comfortable';
  className?: string;
};

const isManual = (pagination: DataTableProps<unknown>['pagination']): pagination is ManualPagination =>
  !!pagination && 'onPageChange' in pagination;

/**
 * A table over @tanstack/react-table: sortable headers are buttons (keyboard-usable) and the sorted
 * column carries aria-sort; numeric columns are right-aligned with tabular figures; optional paging
 * on the client or the server; an empty state instead of an empty grid.
 */
export function DataTable<T>({
  data,
  columns,
  caption,
  showCaption = false,
  getRowId,
  initialSorting = [],
  enableSorting,
  pagination,
  empty,
  density = 'comfortable',
  className,
}: DataTableProps<T>) {
  const manual = isManual(pagination);
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [storedPage, setClientPage] = useState({ pageIndex: 0, pageSize: pagination?.pageSize ?? 25 });
  // Fewer rows than before (a filter) can leave the page past the last one: show the last then.
  const lastPage = Math.max(0, Math.ceil(data.length / storedPage.pageSize) - 1);
  const clientPage = storedPage.pageIndex > lastPage ? { ...storedPage, pageIndex: lastPage } : storedPage;
  const sortingOn = enableSorting ?? !manual;

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table returns new functions each render; nothing here is memoised on them.
  const table = useReactTable<T>({
    data,
    columns,
    getRowId,
    state: {
      sorting,
      ...(pagination ? { pagination: manual ? { pageIndex: pagination.pageIndex, pageSize: pagination.pageSize } : clientPage } : {}),
    },
    enableSorting: sortingOn,
    onSortingChange: setSorting,
    onPaginationChange: manual ? undefined : setClientPage,
    manualPagination: manual,
    rowCount: manual ? pagination.total : undefined,
    autoResetPageIndex: false,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: sortingOn ? getSortedRowModel() : undefined,
    getPaginationRowModel: pagination && !manual ? getPaginationRowModel() : undefined,
  });

  if (data.length === 0 && !(manual && pagination.total > 0)) {
    return <>{empty ?? <EmptyState title="Nothing to show" />}</>;
  }

  const cellPadding = density === 'compact' ? 'px-3 py-1.5' : 'px-3 py-2.5';
  const rows = table.getRowModel().rows;

  return (
    <div className={cn('space-y-3', className)}>
      <div className="relative overflow-x-auto rounded-lg border border-line bg-paper-raised print:overflow-visible">
        <table className="data-table w-full border-collapse text-sm">
          <caption className={showCaption ? 'px-3 pt-3 pb-1 text-left text-sm font-semibold text-ink' : 'sr-only'}>{caption}</caption>
          <thead className="bg-paper">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-line">
                {group.headers.map((header) => {
                  const meta = header.column.columnDef.meta;
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  const label = header.isPlaceholder ? null : flexRender(header.column.columnDef.header, header.getContext());
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      colSpan={header.colSpan}
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className={cn(
                        'text-xs font-semibold text-ink-soft',
                        canSort ? 'px-1.5 py-1' : cellPadding,
                        meta?.numeric ? 'text-right' : 'text-left',
                        meta?.headerClassName,
                      )}
                    >
                      {canSort ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className={cn(
                            'inline-flex items-center gap-1 rounded-sm px-1.5 py-1.5 hover:bg-paper-sunk hover:text-ink',
                            'focus-visible:outline-2 focus-visible:outline-court-500',
                            meta?.numeric ? 'flex-row-reverse' : '',
                            sorted ? 'text-ink' : '',
                          )}
                        >
                          <span>{label}</span>
                          {sorted === 'asc' ? (
                            <SortAscendingIcon className="size-3.5 print:hidden" />
                          ) : sorted === 'desc' ? (
                            <SortDescendingIcon className="size-3.5 print:hidden" />
                          ) : (
                            <SortIcon className="size-3.5 opacity-50 print:hidden" />
                          )}
                        </button>
                      ) : (
                        label
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className="border-b border-line last:border-b-0 hover:bg-paper/60">
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  const Cell = meta?.rowHeader ? 'th' : 'td';
                  return (
                    <Cell
                      key={cell.id}
                      scope={meta?.rowHeader ? 'row' : undefined}
                      className={cn(
                        cellPadding,
                        'align-top text-ink',
                        meta?.rowHeader ? 'text-left font-medium' : '',
                        meta?.numeric ? 'num text-right' : '',
                        meta?.cellClassName,
                      )}
                    >
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </Cell>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {pagination ? <Pager table={table} total={manual ? pagination.total : data.length} onPageChange={manual ? pagination.onPageChange : undefined} /> : null}
    </div>
  );
}

type PagerTable = {
  getState: () => { pagination: { pageIndex: number; pageSize: number } };
  getPageCount: () => number;
  setPageIndex: (index: number) => void;
};

function Pager({ table, total, onPageChange }: { table: PagerTable; total: number; onPageChange?: (pageIndex: number) => void }) {
  const { pageIndex, pageSize } = table.getState().pagination;
  const pageCount = Math.max(1, table.getPageCount());
  const first = total === 0 ? 0 : pageIndex * pageSize + 1;
  const last = Math.min(total, (pageIndex + 1) * pageSize);
  const go = (index: number) => (onPageChange ? onPageChange(index) : table.setPageIndex(index));
  if (pageCount <= 1) {
    return <p className="num text-xs text-ink-soft">{`${formatCount(total)} ${total === 1 ? 'row' : 'rows'}`}</p>;
  }
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 text-sm print:hidden">
      <p className="num text-ink-soft" aria-live="polite">
        {`${formatCount(first)}–${formatCount(last)} of ${formatCount(total)} · page ${pageIndex + 1} of ${pageCount}`}
      </p>
      <div className="flex gap-2">
        <Button size="sm" onClick={() => go(pageIndex - 1)} disabled={pageIndex === 0} icon={<ChevronLeftIcon />}>
          Previous
        </Button>
        <Button size="sm" onClick={() => go(pageIndex + 1)} disabled={pageIndex + 1 >= pageCount} className="flex-row-reverse" icon={<ChevronRightIcon />}>
          Next
        </Button>
      </div>
    </nav>
  );
}
