import { type Governance } from '@shared/governance';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { StatusBadge } from '@/components/status-badge';

/** Every review, newest first: who, when, on which run, the outcome and the findings in full. */
export function ReviewsList({ reviews }: { reviews: Governance['reviews'] }) {
  if (reviews.length === 0) return <p className="text-sm text-ink-soft">No review yet.</p>;
  return (
    <ol className="space-y-4">
      {reviews.map((review) => (
        <li key={review.id} className="break-inside-avoid rounded-md border border-line bg-paper-raised p-4" data-testid="review">
          <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
            <StatusBadge tone={review.outcome === 'validated' ? 'good' : 'caution'}>{review.outcome === 'validated' ? 'Validated' : 'Returned'}</StatusBadge>
            <span className="font-medium text-ink">{review.reviewer.name}</span>
            <time className="text-ink-soft" dateTime={isoDateTime(review.createdAt)}>
              {formatDateTime(review.createdAt)}
            </time>
            <span className="text-ink-soft">on analysis run {review.runId}</span>
          </div>
          <p className="prewrap mt-2 text-sm text-ink">{review.findings}</p>
        </li>
      ))}
    </ol>
  );
}
