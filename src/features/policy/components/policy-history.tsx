import { type PolicyVersion } from '@shared/governance';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { policyRules } from '@/features/policy/components/policy-words';

/** Every version, newest first, with what changed from the one before, who changed it and why. */
export function PolicyHistory({ versions }: { versions: PolicyVersion[] }) {
  return (
    <ol className="divide-y divide-line rounded-lg border border-line bg-paper-raised" data-testid="policy-history">
      {versions.map((version, index) => {
        const previous = versions[index + 1];
        const rules = policyRules(version.policy);
        const before = previous ? policyRules(previous.policy) : null;
        const changed = before ? rules.filter((rule, i) => rule.value !== before[i].value) : rules;
        return (
          <li key={version.policy.version} className="px-4 py-3 text-sm">
            <p className="font-medium text-ink">
              Version {version.policy.version}
              {index === 0 ? <span className="ml-2 text-xs font-normal text-good-strong">current</span> : null}
            </p>
            <p className="text-ink-soft">
              {version.createdBy ? version.createdBy.name : 'Default'} · <time dateTime={isoDateTime(version.createdAt)}>{formatDateTime(version.createdAt)}</time> · {version.reason}
            </p>
            {changed.length > 0 ? (
              <ul className="mt-1 list-disc pl-5 text-ink">
                {changed.map((rule) => (
                  <li key={rule.label}>
                    {rule.label}: {rule.value}
                  </li>
                ))}
              </ul>
            ) : (
              <p className="mt-1 text-ink-soft">Same rules as version {previous?.policy.version}.</p>
            )}
          </li>
        );
      })}
    </ol>
  );
}
