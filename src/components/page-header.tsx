import { type ReactNode } from 'react';

type PageHeaderProps = {
  title: ReactNode;
  subtitle?: ReactNode;
  /** A small line above the title: the area of the app or the parent record. */
  eyebrow?: ReactNode;
  /** Buttons on the right (wrap under the title on narrow screens). */
  actions?: ReactNode;
  /** Content under the title row, e.g. a state badge or Tabs. */
  children?: ReactNode;
};

/** The top of every page: its one h1, a subtitle and the page's main actions. */
export function PageHeader({ title, subtitle, eyebrow, actions, children }: PageHeaderProps) {
  return (
    <header className="mb-6 space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div className="min-w-0 space-y-1">
          {eyebrow ? <p className="text-xs font-semibold tracking-wide text-court-600 uppercase">{eyebrow}</p> : null}
          <h1 className="text-2xl font-semibold tracking-tight text-ink">{title}</h1>
          {subtitle ? <p className="max-w-3xl text-sm text-ink-soft">{subtitle}</p> : null}
        </div>
        {actions ? <div className="flex flex-wrap items-center gap-2 print:hidden">{actions}</div> : null}
      </div>
      {children}
    </header>
  );
}
