import { NavLink } from 'react-router';
import { cn } from '@/lib/cn';

export interface TabItem {
  to: string;
  label: string;
  /** Match the URL exactly (for the first tab, whose URL is a prefix of the others). */
  end?: boolean;
}

/**
 * Page-level tabs that are links (each tab is its own URL, e.g. a comparison's verdict, curves and
 * swap sets). The current one carries aria-current="page" (set by NavLink) and a visible underline.
 */
export function Tabs({ label, items, className }: { label: string; items: TabItem[]; className?: string }) {
  return (
    <nav aria-label={label} className={cn('border-b border-line print:hidden', className)}>
      <ul className="-mb-px flex flex-wrap gap-x-1 md:flex-nowrap md:overflow-x-auto">
        {items.map((item) => (
          <li key={item.to}>
            <NavLink
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                cn(
                  'inline-flex h-10 items-center border-b-2 px-3 text-sm font-medium whitespace-nowrap',
                  'focus-visible:outline-2 focus-visible:-outline-offset-2 focus-visible:outline-court-500',
                  isActive ? 'border-court-700 text-ink' : 'border-transparent text-ink-soft hover:border-line-strong hover:text-ink',
                )
              }
            >
              {item.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
