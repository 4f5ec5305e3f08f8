import { type AuditEvent } from '@shared/governance';
import { formatCount } from '@/lib/format';

/**
 * An audit event in plain words for the timeline: what happened, and the details that matter.
 * Unknown actions fall back to the dotted verb, so a new kind of event still shows.
 */

const labels: Record<string, string> = {
  'holdout.uploaded': 'Uploaded the holdout',
  'comparison.created': 'Created the comparison',
  'comparison.setup': 'Changed the mapping or settings and started a new analysis',
  'comparison.analysed': 'The analysis finished: analysed',
  'analysis.done': 'An analysis run finished',
  'analysis.failed': 'An analysis run failed',
  'analysis.requeued': 'An interrupted analysis run was queued again',
  'analysis.retried': 'An analysis run was tried again',
  'verdict.recorded': 'Recorded a verdict',
  'scenario.saved': 'Saved a cut-off scenario',
  'note.added': 'Wrote a note',
  'comparison.submitted': 'Submitted for review',
  'comparison.validated': 'Validated',
  'comparison.returned': 'Returned to the modeler',
  'vote.cast': 'Voted',
  'vote.changed': 'Changed their vote',
  'comparison.decided': 'Recorded the decision',
  'policy.changed': 'Changed the adoption policy',
};

export function auditLabel(action: string): string {
  return labels[action] ?? action;
}

const outcomeWords: Record<string, string> = {
  supported: 'supported',
  'not-proven': 'not proven',
  'champion-better': 'champion better',
  adopt: 'adopt the challenger',
  keep: 'keep the champion',
  defer: 'defer',
};

function text(value: unknown): string | null {
  return typeof value === 'string' && value.trim() ? value : null;
}

/** One short line of the event's details (the timeline shows the rest on demand). */
export function auditSummary(event: AuditEvent): string | null {
  const d = event.details;
  switch (event.action) {
    case 'holdout.uploaded':
      return [text(d.fileName), typeof d.rowCount === 'number' ? `${formatCount(d.rowCount)} rows` : null].filter(Boolean).join(', ') || null;
    case 'verdict.recorded':
      return `${outcomeWords[String(d.outcome)] ?? String(d.outcome)} under policy version ${String(d.policyVersion)}${d.reason === 're-evaluation' ? ' (re-evaluation)' : ''}, run ${String(d.runId)}`;
    case 'analysis.done':
      return `run ${String(d.runId)}, engine ${String(d.engineVersion)}`;
    case 'analysis.failed':
      return text(d.error);
    case 'comparison.submitted':
      return text(d.message);
    case 'comparison.validated':
    case 'comparison.returned':
      return text(d.findings);
    case 'vote.cast':
    case 'vote.changed':
      return [outcomeWords[String(d.vote)] ?? String(d.vote), text(d.comment)].filter(Boolean).join(': ');
    case 'comparison.decided':
      return `${outcomeWords[String(d.outcome)] ?? String(d.outcome)}${text(d.effectiveDate) ? ` from ${String(d.effectiveDate)}` : ''} (policy version ${String(d.policyVersion)})`;
    case 'note.added':
      return text(d.body);
    case 'scenario.saved':
      return text(d.name);
    case 'policy.changed':
      return `version ${String(d.version)}: ${String(d.reason ?? '')}`;
    default:
      return null;
  }
}
