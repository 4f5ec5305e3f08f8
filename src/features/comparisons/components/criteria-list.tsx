import { type Verdict } from '@shared/report';
import { StatusBadge } from '@/components/status-badge';

/** Each criterion of the adoption policy, met or not, with the numbers that decided it. */
export function CriteriaList({ verdict }: { verdict: Pick<Verdict, 'criteria' | 'policyVersion'> }) {
  const met = verdict.criteria.filter((criterion) => criterion.met).length;
  return (
    <div className="space-y-3">
      <p className="text-sm text-ink-soft">
        {met} of {verdict.criteria.length} criteria met under adoption policy version {verdict.policyVersion}.
      </p>
      <ul className="divide-y divide-line rounded-lg border border-line bg-paper-raised">
        {verdict.criteria.map((criterion) => (
          <li key={criterion.id} className="flex flex-col gap-1.5 px-4 py-3 sm:flex-row sm:items-start sm:gap-4">
            <div className="w-28 shrink-0">
              <StatusBadge tone={criterion.met ? 'good' : 'bad'}>{criterion.met ? 'Met' : 'Not met'}</StatusBadge>
            </div>
            <div className="min-w-0 text-sm">
              <p className="font-medium text-ink">{criterion.label}</p>
              <p className="text-ink-soft">{criterion.detail}</p>
            </div>
          </li>
        ))}
      </ul>
    </div>
  );
}
