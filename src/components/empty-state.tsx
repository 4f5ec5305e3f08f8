import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';

type EmptyStateProps = {
  title: ReactNode;
  children?: ReactNode;
  /** The next step: a button or link. */
  action?: ReactNode;
  className?: string;
};

/** Nothing here yet: says so plainly and offers the next step. */
export function EmptyState({ title, children, action, className }: EmptyStateProps) {
  return (
    <div className={cn('rounded-md border border-dashed border-line-strong px-6 py-10 text-center', className)}>
      <p className="text-sm font-semibold text-ink">{title}</p>
      {children ? <div className="mx-auto mt-1 max-w-md text-sm text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}
