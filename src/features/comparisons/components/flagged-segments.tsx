import { flaggedSegmentsOf } from '@shared/challenger-sections';
import { type Report } from '@shared/report';
import { formatGiniDelta, formatInterval, formatPValue } from '@/lib/format';
import { StatusBadge } from '@/components/status-badge';

/**
 * The segment values where the challenger is significantly or materially worse (the flags of the
 * report's segment rows), so the verdict page shows the harm the headline numbers can hide.
 * `challenger`: with several challengers, which one (index; 0 = the primary), named by `name`.
 */
export function FlaggedSegments({ report, challenger = 0, name }: { report: Pick<Report, 'segments' | 'challengers'>; challenger?: number; name?: string }) {
  const flagged = flaggedSegmentsOf(report, challenger);
  if (flagged.length === 0) {
    return <p className="text-sm text-ink-soft">No segment value is significantly or materially worse for {name ?? 'the challenger'}.</p>;
  }
  return (
    <ul className="space-y-2" aria-label={name === undefined ? 'Flagged segment values' : `Flagged segment values of ${name}`}>
      {flagged.map((row) => (
        <li key={`${row.column}=${row.value}`} className="flex flex-wrap items-center gap-2 text-sm" data-testid="flagged-segment">
          <span className="font-medium text-ink">
            {row.column} = {row.value}
          </span>
          {row.flags.includes('significantly-worse') ? <StatusBadge tone="bad">Significantly worse</StatusBadge> : null}
          {row.flags.includes('materially-worse') ? <StatusBadge tone="bad">Materially worse</StatusBadge> : null}
          <span className="text-ink-soft">
            ΔGini {formatGiniDelta(row.deltaGini)} points, interval {formatInterval(row.giniCi, formatGiniDelta)}, Holm-adjusted {formatPValue(row.pHolm)}
          </span>
        </li>
      ))}
    </ul>
  );
}

/** Several challengers: each challenger's flagged segment values under its name, the same rows its verdict was judged on. */
export function FlaggedSegmentsByChallenger({ report }: { report: Pick<Report, 'segments' | 'challengers'> }) {
  return (
    <div className="space-y-4" data-testid="flagged-segments-by-challenger">
      {(report.challengers ?? []).map((challenger, index) => (
        <div key={challenger.column} className="space-y-2" data-testid="challenger-flagged-segments">
          <h3 className="text-sm font-semibold text-ink">
            {challenger.name} <span className="font-normal text-ink-soft">(challenger {index + 1})</span>
          </h3>
          {index > 0 && challenger.segments === undefined ? (
            <p className="text-sm text-ink-soft">This report has no segment rows for {challenger.name}; run the analysis again to check its segments.</p>
          ) : (
            <FlaggedSegments report={report} challenger={index} name={challenger.name} />
          )}
        </div>
      ))}
    </div>
  );
}
