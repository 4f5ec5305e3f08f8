import { type ReactNode } from 'react';
import { type Role, roleLabels, roles as allRoles } from '@shared/roles';
import { roleGuide } from '@/config/role-guide';
import { CheckIcon } from '@/components/icons';

type RoleOverviewProps = {
  roles: readonly Role[];
  /** Links to the pages a role opens, shown under its duties. */
  actions?: Partial<Record<Role, ReactNode>>;
};

/** One card per role the person holds: what it lets them do. */
export function RoleOverview({ roles, actions = {} }: RoleOverviewProps) {
  const held = allRoles.filter((role) => roles.includes(role));
  return (
    <ul className={held.length > 1 ? 'grid gap-4 md:grid-cols-2' : 'grid gap-4'}>
      {held.map((role) => (
        <li key={role} className="flex flex-col rounded-lg border border-line bg-paper-raised p-5">
          <h3 className="text-base font-semibold text-ink">{roleLabels[role]}</h3>
          <p className="mt-1 text-sm text-ink-soft">{roleGuide[role].summary}</p>
          <ul className="mt-3 flex-1 space-y-1.5 text-sm text-ink">
            {roleGuide[role].duties.map((duty) => (
              <li key={duty} className="flex gap-2">
                <CheckIcon className="mt-0.5 size-4 shrink-0 text-good" />
                <span>{duty}</span>
              </li>
            ))}
          </ul>
          {actions[role] ? <div className="mt-4 flex flex-wrap gap-2">{actions[role]}</div> : null}
        </li>
      ))}
    </ul>
  );
}

/** The roles the person does not hold, in one line each, so they know whom to ask. */
export function OtherRoles({ roles }: { roles: readonly Role[] }) {
  const others = allRoles.filter((role) => !roles.includes(role));
  if (others.length === 0) return <p className="text-sm text-ink-soft">You hold every role.</p>;
  return (
    <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
      {others.map((role) => (
        <div key={role} className="contents">
          <dt className="font-medium text-ink">{roleLabels[role]}</dt>
          <dd className="text-ink-soft">{roleGuide[role].summary}</dd>
        </div>
      ))}
    </dl>
  );
}
