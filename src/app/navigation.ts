import { type Role } from '@shared/roles';
import { paths } from '@/config/paths';

export interface NavItem {
  label: string;
  to: string;
  /** Shown to people with any of these roles; everyone when absent. */
  roles?: Role[];
  end?: boolean;
}

/**
 * The main navigation, by role. Only pages that exist are listed: Comparisons (everyone), New
 * comparison (modelers) and Adoption policy (admins) join here with their pages (paths.ts has
 * their URLs already).
 */
export const navigation: NavItem[] = [
  { label: 'Home', to: paths.home(), end: true },
  { label: 'People', to: paths.admin.people(), roles: ['admin'] },
  { label: 'Outbox', to: paths.admin.outbox(), roles: ['admin'] },
];
