import { type ReactNode, useId, useState } from 'react';
import { cn } from '@/lib/cn';
import { Button } from '@/components/button';

type ChartFrameProps = {
  title: ReactNode;
  /**
   * The chart's text alternative: the key numbers in a sentence or two. Shown under the chart for
   * everyone and tied to the drawing with aria-describedby.
   */
  caption: ReactNode;
  legend?: ReactNode;
  /** The chart itself; hidden from screen readers in favour of the caption and the table. */
  children: ReactNode;
  /** The same data as a table; a button switches between the two. */
  table?: ReactNode;
  /** Height of the drawing area (the chart is responsive in width). */
  height?: number;
  actions?: ReactNode;
  className?: string;
};

/**
 * A figure around a chart: title, legend, the drawing, its caption (the text alternative) and a
 * "Show as table" switch for the numbers behind it. Keyboard and screen-reader users get the
 * caption and the table; the drawing is marked as an image described by the caption.
 */
export function ChartFrame({ title, caption, legend, children, table, height = 320, actions, className }: ChartFrameProps) {
  const [asTable, setAsTable] = useState(false);
  const captionId = useId();
  const titleId = useId();
  return (
    <figure aria-labelledby={titleId} className={cn('min-w-0 rounded-lg border border-line bg-paper-raised p-4 break-inside-avoid', className)}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <h3 id={titleId} className="text-sm font-semibold text-ink">
          {title}
        </h3>
        <div className="flex flex-wrap items-center gap-2 print:hidden">
          {actions}
          {table ? (
            <Button size="sm" variant="ghost" aria-pressed={asTable} onClick={() => setAsTable((value) => !value)}>
              {asTable ? 'Show as chart' : 'Show as table'}
            </Button>
          ) : null}
        </div>
      </div>
      {legend && !asTable ? <div className="mt-2">{legend}</div> : null}
      <div className="mt-3">
        {asTable ? (
          <div className="max-h-[28rem] overflow-y-auto">{table}</div>
        ) : (
          <div role="img" aria-labelledby={titleId} aria-describedby={captionId} style={{ height }} className="w-full">
            {children}
          </div>
        )}
      </div>
      <figcaption id={captionId} className="mt-3 max-w-prose text-sm text-ink-soft">
        {caption}
      </figcaption>
    </figure>
  );
}
