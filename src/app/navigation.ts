import { type Role } from '@shared/roles';
import { paths } from '@/config/paths';

export interface NavItem {
  label: string;
  to: string;
  /** Shown to people with any of these roles; everyone when absent. */
  roles?: Role[];
  end?: boolean;
  /** Router patterns under `to` where this entry is not the current one (another entry is). */
  except?: string[];
}

/**
 * The main navigation, by role. Everyone may read the adoption policy (only admins change it), so
 * its page is listed for everyone.
 */
export const navigation: NavItem[] = [
  { label: 'Home', to: paths.home(), end: true },
  // Comparisons stays current on a comparison's pages, but not on New comparison (its own entry).
  { label: 'Comparisons', to: paths.comparisons.list(), except: [paths.comparisons.new.pattern] },
  { label: 'New comparison', to: paths.comparisons.new(), roles: ['modeler'], end: true },
  { label: 'Adoption policy', to: paths.admin.policy() },
  { label: 'People', to: paths.admin.people(), roles: ['admin'] },
  { label: 'Outbox', to: paths.admin.outbox(), roles: ['admin'] },
];
