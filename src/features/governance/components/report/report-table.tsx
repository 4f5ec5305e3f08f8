import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';

/**
 * A compact table for the printable report: a header row, body rows, numbers right-aligned and
 * in tabular figures; rows never split across pages and the header repeats on each page.
 */
export function ReportTable({
  caption,
  head,
  rows,
  numeric = [],
  nowrap = [],
  className,
}: {
  caption: string;
  head: ReactNode[];
  rows: ReactNode[][];
  /** Indexes of the columns holding numbers. */
  numeric?: number[];
  /** Indexes of short columns that must not wrap (numbers always stay on one line). */
  nowrap?: number[];
  className?: string;
}) {
  // Eight columns or more do not fit a portrait page: printed on a landscape page (styles.css).
  const wide = head.length >= 8;
  const align = (index: number) =>
    cn(numeric.includes(index) ? 'text-right num' : 'text-left', (numeric.includes(index) || nowrap.includes(index)) && 'whitespace-nowrap');
  return (
    <div className={cn('report-table-frame', wide && 'report-wide')}>
    <table className={cn('w-full border-collapse text-sm', className)}>
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b border-line-strong">
          {head.map((cell, index) => (
            <th key={index} scope="col" className={cn('px-2 py-1.5 text-xs font-semibold text-ink-soft', align(index))}>
              {cell}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((row, rowIndex) => (
          <tr key={rowIndex} className="border-b border-line">
            {row.map((cell, index) =>
              index === 0 ? (
                <th key={index} scope="row" className={cn('bg-paper-raised px-2 py-1.5 text-left font-medium text-ink', nowrap.includes(0) && 'whitespace-nowrap')}>
                  {cell}
                </th>
              ) : (
                <td key={index} className={cn('px-2 py-1.5 text-ink', align(index))}>
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

/** A label–value list for the report's facts (file, hash, settings). */
export function FactList({ facts }: { facts: [string, ReactNode][] }) {
  return (
    <dl className="grid grid-cols-[minmax(9rem,auto)_1fr] gap-x-4 gap-y-1 text-sm">
      {facts.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="text-ink-soft">{label}</dt>
          <dd className="min-w-0 text-ink">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

/** One part of the printable report; parts after the first start on a new page when printed. */
export function ReportPart({ title, children, id }: { title: string; children: ReactNode; id?: string }) {
  return (
    <section className="report-part space-y-5" aria-labelledby={id}>
      <h2 id={id} className="border-b-2 border-ink pb-1 text-lg font-semibold text-ink">
        {title}
      </h2>
      {children}
    </section>
  );
}

/** A titled block inside a part, kept together on a page when it fits. */
export function ReportBlock({ title, note, children }: { title: string; note?: ReactNode; children: ReactNode }) {
  return (
    <div className="report-block space-y-2">
      <h3 className="text-sm font-semibold text-ink">{title}</h3>
      {note ? <p className="text-xs text-ink-soft">{note}</p> : null}
      {children}
    </div>
  );
}
