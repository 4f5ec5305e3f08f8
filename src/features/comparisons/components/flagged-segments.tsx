import { type Report } from '@shared/report';
import { formatGiniDelta, formatInterval, formatPValue } from '@/lib/format';
import { StatusBadge } from '@/components/status-badge';

/**
 * The segment values where the challenger is significantly or materially worse (the flags of the
 * report's segment rows), so the verdict page shows the harm the headline numbers can hide.
 */
export function FlaggedSegments({ report }: { report: Report }) {
  const flagged = report.segments.filter((row) => row.flags.length > 0);
  if (flagged.length === 0) {
    return <p className="text-sm text-ink-soft">No segment value is significantly or materially worse for the challenger.</p>;
  }
  return (
    <ul className="space-y-2" aria-label="Flagged segment values">
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
