import { type PolicyVersion } from '@shared/governance';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { policyRules } from '@/features/policy/components/policy-words';

/** The current policy's rules, and who made this version, when and why. */
export function PolicySummary({ version }: { version: PolicyVersion }) {
  return (
    <div className="space-y-4">
      <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[10rem_1fr]" data-testid="policy-rules">
        {policyRules(version.policy).map((rule) => (
          <div key={rule.label} className="contents">
            <dt className="text-ink-soft">{rule.label}</dt>
            <dd className="text-ink">{rule.value}</dd>
          </div>
        ))}
      </dl>
      <p className="text-sm text-ink-soft">
        Version {version.policy.version}, {version.createdBy ? `set by ${version.createdBy.name}` : 'the default'} on{' '}
        <time dateTime={isoDateTime(version.createdAt)}>{formatDateTime(version.createdAt)}</time>: {version.reason}
      </p>
    </div>
  );
}
