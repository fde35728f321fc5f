import { NavLink } from 'react-router-dom';
import type { Role } from '#shared/schemas/enums.ts';
import { navigationFor } from '../../config/navigation.ts';
import { cn } from '../../lib/cn.ts';

/** The role's pages from the navigation table: a column on wide screens, a scrolling row on narrow ones. */
export function SideNav({ role }: { role: Role }) {
  const entries = navigationFor(role);
  return (
    <nav aria-label="Main" className="border-b border-basin-200 bg-white md:w-60 md:shrink-0 md:border-r md:border-b-0">
      <ul className="flex gap-1 overflow-x-auto px-3 py-2 md:flex-col md:px-3 md:py-4">
        {entries.map((entry) => (
          <li key={entry.id}>
            <NavLink
              to={entry.path}
              end={entry.path === '/'}
              className={({ isActive }) =>
                cn(
                  'block rounded-md px-3 py-2 text-sm whitespace-nowrap transition-colors',
                  isActive ? 'bg-tide-50 font-bold text-tide-800 md:shadow-[inset_3px_0_0_#1a677d]' : 'text-basin-700 hover:bg-basin-100 hover:text-basin-900',
                )
              }
            >
              {entry.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
