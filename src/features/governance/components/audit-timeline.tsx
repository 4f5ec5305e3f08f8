import { type AuditEvent } from '@shared/governance';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { CautionIcon, CheckCircleIcon } from '@/components/icons';
import { auditLabel, auditSummary } from '@/features/governance/lib/audit-words';

/** Whether the whole audit chain verifies, in words. */
export function ChainStatus({ valid, events }: { valid: boolean; events: number }) {
  return valid ? (
    <p className="flex items-start gap-2 text-sm text-good-strong" data-testid="chain-status">
      <CheckCircleIcon className="mt-0.5 size-4 shrink-0" />
      <span>
        The audit chain verifies: every event carries the hash of the one before it, and none has been changed or removed. {events}{' '}
        {events === 1 ? 'event concerns' : 'events concern'} this comparison.
      </span>
    </p>
  ) : (
    <p className="flex items-start gap-2 text-sm font-medium text-bad-strong" data-testid="chain-status">
      <CautionIcon className="mt-0.5 size-4 shrink-0" />
      <span>The audit chain does not verify: an event was changed, removed or reordered. Tell your administrator; the trail below may not be complete or true.</span>
    </p>
  );
}

/** What an event records, in words: its label and the details that matter. */
export function AuditEventWhat({ event }: { event: AuditEvent }) {
  const summary = auditSummary(event);
  return (
    <>
      <span className="font-medium text-ink">{auditLabel(event.action)}</span>
      {summary ? <span className="prewrap block text-ink-soft">{summary}</span> : null}
    </>
  );
}

/** The comparison's audit events in order: when, who, what, and its details on demand. */
export function AuditTimeline({ events, compact = false }: { events: AuditEvent[]; compact?: boolean }) {
  return (
    <ol className="relative space-y-0 border-l border-line pl-4" data-testid="audit-timeline">
      {events.map((event) => {
        const summary = auditSummary(event);
        return (
          <li key={event.id} className="relative break-inside-avoid pb-3 text-sm">
            <span aria-hidden="true" className="absolute top-1.5 -left-[1.3rem] size-2 rounded-full bg-court-400" />
            <p className="text-xs text-ink-soft">
              <time dateTime={isoDateTime(event.createdAt)}>{formatDateTime(event.createdAt)}</time> · {event.actor?.name ?? 'Scorecourt'}
            </p>
            <p className="font-medium text-ink" data-action={event.action}>
              {auditLabel(event.action)}
            </p>
            {summary ? <p className={compact ? 'line-clamp-2 text-ink-soft' : 'prewrap text-ink-soft'}>{summary}</p> : null}
            {compact ? null : (
              <details className="mt-1 print:hidden">
                <summary className="cursor-pointer text-xs text-court-700">Details and hash</summary>
                <pre className="mt-1 overflow-x-auto rounded bg-paper-sunk p-2 text-xs">{JSON.stringify(event.details, null, 2)}</pre>
                <p className="mt-1 font-mono text-[11px] break-all text-ink-faint">hash {event.hash}</p>
              </details>
            )}
          </li>
        );
      })}
    </ol>
  );
}
