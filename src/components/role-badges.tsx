import { type Role, roleLabels, roles as allRoles } from '@shared/roles';
import { cn } from '@/lib/cn';

/** A person's roles as small labelled chips, in the fixed order of shared/roles.ts. */
export function RoleBadges({ roles, className }: { roles: readonly Role[]; className?: string }) {
  const ordered = allRoles.filter((role) => roles.includes(role));
  return (
    <ul className={cn('flex flex-wrap gap-1', className)} aria-label="Roles">
      {ordered.map((role) => (
        <li key={role} className="rounded-sm border border-court-200 bg-court-50 px-1.5 py-0.5 text-xs leading-4 font-medium text-court-700">
          {roleLabels[role]}
        </li>
      ))}
    </ul>
  );
}
