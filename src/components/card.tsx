import { type ComponentProps, type ReactNode, useId } from 'react';
import { cn } from '@/lib/cn';

/** A raised panel with a hairline border. */
export function Card({ className, children, ...props }: ComponentProps<'div'>) {
  return (
    <div className={cn('rounded-lg border border-line bg-paper-raised print:border-ink-faint', className)} {...props}>
      {children}
    </div>
  );
}

type SectionProps = {
  title: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
  /** h2 by default; h3 inside another section. */
  level?: 2 | 3;
  /** Draw the section as a card (default) or as plain page content. */
  framed?: boolean;
  className?: string;
  children?: ReactNode;
};

/** A titled part of a page; the heading names the region for screen readers. */
export function Section({ title, description, actions, level = 2, framed = true, className, children }: SectionProps) {
  const headingId = useId();
  const Heading = level === 2 ? 'h2' : 'h3';
  const body = (
    <>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0 space-y-1">
          <Heading id={headingId} className={level === 2 ? 'text-base font-semibold text-ink' : 'text-sm font-semibold text-ink'}>
            {title}
          </Heading>
          {description ? <p className="max-w-prose text-sm text-ink-soft">{description}</p> : null}
        </div>
        {actions ? <div className="flex shrink-0 flex-wrap items-center gap-2">{actions}</div> : null}
      </div>
      {children ? <div className="mt-4">{children}</div> : null}
    </>
  );
  return (
    <section
      aria-labelledby={headingId}
      className={cn(framed ? 'rounded-lg border border-line bg-paper-raised p-5 print:border-ink-faint' : '', 'break-inside-avoid-page', className)}
    >
      {body}
    </section>
  );
}
