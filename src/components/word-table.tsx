import { type WordTable } from '@shared/word-table';
import { cn } from '@/lib/cn';

/**
 * A table of words (shared/word-table.ts) on a page: a header row, the first cell of each
 * row names it, the other cells are right-aligned figures unless `textColumns` says otherwise. Wide
 * tables scroll inside their frame, never the page.
 */
export function WordTableView({
  table,
  caption,
  textColumns = [0],
  highlightRow,
  className,
  testId,
}: {
  table: WordTable;
  caption: string;
  /** Indexes of the columns holding words (left-aligned); the rest are figures. */
  textColumns?: number[];
  /** A row to emphasise (the recommended model). */
  highlightRow?: number | null;
  className?: string;
  testId?: string;
}) {
  const align = (index: number) => (textColumns.includes(index) ? 'text-left' : 'num text-right whitespace-nowrap');
  return (
    <div className={cn('max-w-full overflow-x-auto rounded-lg border border-line', className)} data-testid={testId}>
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-line-strong bg-paper-sunk">
            {table.head.map((cell, index) => (
              <th key={index} scope="col" className={cn('px-3 py-2 text-xs font-semibold text-ink-soft', align(index))}>
                {cell}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {table.rows.map((row, rowIndex) => (
            <tr key={rowIndex} className={cn('border-b border-line last:border-b-0', highlightRow === rowIndex && 'bg-court-50')}>
              {row.map((cell, index) =>
                index === 0 ? (
                  <th key={index} scope="row" className="px-3 py-2 text-left font-medium text-ink">
                    {cell}
                  </th>
                ) : (
                  <td key={index} className={cn('px-3 py-2 text-ink', align(index))}>
                    {cell}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
