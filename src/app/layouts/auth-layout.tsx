import { type ReactNode } from 'react';
import { ScorecourtMark } from '@/components/icons';

/** The frame of the signed-out pages: the product name, one card, and a line on what this is. */
export function AuthLayout({ title, subtitle, children }: { title: ReactNode; subtitle?: ReactNode; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-paper px-4 py-12 sm:py-20">
      <div className="w-full max-w-md">
        <p className="mb-8 flex items-center justify-center gap-2.5 text-lg font-semibold tracking-tight text-court-900">
          <ScorecourtMark className="size-8" />
          <span>Scorecourt</span>
        </p>
        <main className="rounded-lg border border-line bg-paper-raised px-6 py-7 shadow-sm sm:px-8">
          <h1 className="text-xl font-semibold tracking-tight text-ink">{title}</h1>
          {subtitle ? <p className="mt-1.5 text-sm text-ink-soft">{subtitle}</p> : null}
          <div className="mt-6">{children}</div>
        </main>
        <p className="mt-6 text-center text-xs text-ink-soft">Champion–challenger comparisons for credit-scoring models</p>
      </div>
    </div>
  );
}
