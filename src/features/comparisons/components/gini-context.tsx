import { type Report } from '@shared/report';
import { formatGini } from '@/lib/format';

/**
 * The usual reading of a Gini (docs/design.md; common practice, no source): for application scoring
 * above roughly 50 is considered good; for behavioural scoring below roughly 60 is considered weak.
 */
export function GiniContext({ report }: { report: Report }) {
  const champion = formatGini(report.champion.gini);
  const challenger = formatGini(report.challenger.gini);
  return (
    <div className="space-y-2 text-sm text-ink-soft">
      <p>
        The champion’s Gini is <span className="num font-medium text-ink">{champion}</span> and the challenger’s{' '}
        <span className="num font-medium text-ink">{challenger}</span> points on this holdout. How good that is depends on the kind of model:
      </p>
      <ul className="list-disc space-y-1 pl-5">
        <li>
          <span className="font-medium text-ink">Application scoring</span> (new applicants): above roughly 50 is usually considered good.
        </li>
        <li>
          <span className="font-medium text-ink">Behavioural scoring</span> (existing accounts, with payment history): below roughly 60 is usually
          considered weak.
        </li>
      </ul>
      <p className="text-xs">These thresholds are common practice in the trade, not from a published source; the data, product and population matter more.</p>
    </div>
  );
}
