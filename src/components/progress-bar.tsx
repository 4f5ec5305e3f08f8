import { type ReactNode, useId } from 'react';
import { cn } from '@/lib/cn';

type ProgressBarProps = {
  /** What is progressing ("Uploading holdout.csv"). */
  label: ReactNode;
  /** Progress in [0, 1]; null while the total is unknown (indeterminate). */
  value: number | null;
  /** A readable value for screen readers and the eye ("12.4 MB of 50.0 MB"); default: the percentage. */
  valueText?: string;
  tone?: 'court' | 'good' | 'bad';
  className?: string;
};

/** A progress bar for uploads and analyses, with aria-valuenow and the value in words. */
export function ProgressBar({ label, value, valueText, tone = 'court', className }: ProgressBarProps) {
  const labelId = useId();
  const percent = value === null ? null : Math.round(Math.min(1, Math.max(0, value)) * 100);
  const text = valueText ?? (percent === null ? 'Working…' : `${percent}%`);
  const fill = tone === 'good' ? 'bg-good' : tone === 'bad' ? 'bg-bad' : 'bg-court-600';
  return (
    <div className={cn('space-y-1.5', className)}>
      <div className="flex items-baseline justify-between gap-3 text-sm">
        <span id={labelId} className="font-medium text-ink">
          {label}
        </span>
        <span className="num text-ink-soft">{text}</span>
      </div>
      <div
        role="progressbar"
        aria-labelledby={labelId}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent ?? undefined}
        aria-valuetext={text}
        className="h-2.5 overflow-hidden rounded-full border border-line bg-paper-sunk"
      >
        {percent === null ? (
          <div className="h-full w-1/3 animate-[progress-slide_1.4s_ease-in-out_infinite] rounded-full bg-court-400 motion-reduce:w-full motion-reduce:animate-none motion-reduce:opacity-40" />
        ) : (
          <div className={cn('h-full rounded-full transition-[width] duration-200', fill)} style={{ width: `${percent}%` }} />
        )}
      </div>
    </div>
  );
}
