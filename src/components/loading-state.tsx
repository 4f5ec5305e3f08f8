import { cn } from '@/lib/cn';
import { Spinner } from '@/components/spinner';

type LoadingStateProps = {
  /** What is loading, in words: "Loading people…". */
  label?: string;
  /** spinner: a line with a spinner; skeleton: grey bars in the shape of rows. */
  variant?: 'spinner' | 'skeleton';
  rows?: number;
  className?: string;
};

/** Something is on its way: announced politely, marked busy, and always with a text. */
export function LoadingState({ label = 'Loading…', variant = 'spinner', rows = 5, className }: LoadingStateProps) {
  return (
    <div role="status" aria-busy="true" aria-live="polite" className={cn('text-sm text-ink-soft', className)}>
      <div className="flex items-center gap-2 py-2">
        <Spinner className="size-4 text-court-500" />
        <span>{label}</span>
      </div>
      {variant === 'skeleton' ? (
        <div aria-hidden="true" className="mt-2 space-y-2.5">
          {Array.from({ length: rows }, (_, index) => (
            <div key={index} className="flex gap-3">
              <div className="h-4 w-1/4 animate-pulse rounded-sm bg-paper-sunk motion-reduce:animate-none" />
              <div className="h-4 flex-1 animate-pulse rounded-sm bg-paper-sunk motion-reduce:animate-none" />
              <div className="h-4 w-1/6 animate-pulse rounded-sm bg-paper-sunk motion-reduce:animate-none" />
            </div>
          ))}
        </div>
      ) : null}
    </div>
  );
}
