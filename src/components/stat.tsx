import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';

/** A row or grid of Stats; a description list, so each label names its value. */
export function StatGroup({ children, className }: { children: ReactNode; className?: string }) {
  return <dl className={cn('grid grid-cols-[repeat(auto-fill,minmax(11rem,1fr))] gap-3', className)}>{children}</dl>;
}

type StatProps = {
  label: ReactNode;
  /** The formatted value ("42.1"); format with lib/format.ts. */
  value: ReactNode;
  /** A unit after the value ("points", "%"). */
  unit?: ReactNode;
  /** The formatted interval ("40.2 to 44.0"), shown under the value. */
  interval?: ReactNode;
  /** What the interval is ("95% DeLong interval"). */
  intervalLabel?: ReactNode;
  /** A short note: method, source or caveat. */
  footnote?: ReactNode;
  /** A marker of which model the number belongs to, or a state badge. */
  adornment?: ReactNode;
  className?: string;
};

/** One metric: label, value (tabular figures), its interval and a footnote. Use inside StatGroup. */
export function Stat({ label, value, unit, interval, intervalLabel, footnote, adornment, className }: StatProps) {
  return (
    <div className={cn('rounded-lg border border-line bg-paper-raised px-4 py-3 break-inside-avoid', className)}>
      <dt className="flex items-center justify-between gap-2 text-xs font-medium text-ink-soft">
        <span>{label}</span>
        {adornment}
      </dt>
      <dd className="num mt-1 text-2xl font-semibold tracking-tight text-ink">
        {value}
        {unit ? <span className="ml-1 text-sm font-normal text-ink-soft">{unit}</span> : null}
      </dd>
      {interval ? (
        <dd className="num text-sm text-ink-soft">
          {intervalLabel ? <span>{intervalLabel}: </span> : null}
          {interval}
        </dd>
      ) : null}
      {footnote ? <dd className="mt-1 text-xs text-ink-faint">{footnote}</dd> : null}
    </div>
  );
}
