import { roles, type Role } from '#shared/schemas/enums.ts';

// The one role → page table of the client. The side navigation lists a role's entries from it, and
// the router's guards refuse the others with it, so what a person sees and what they may open
// cannot drift apart. The server checks the same roles on every API route (server/routes/*.ts);
// this table only decides what the client offers.

export interface PageEntry {
  id: string;
  /** Route path, also the link target. */
  path: string;
  label: string;
  /** Roles that may open the page. */
  roles: readonly Role[];
  /** Roles that may change what the page shows; the others get it read-only. */
  editRoles?: readonly Role[];
  /** False while the page's API does not exist yet: hidden from the navigation and not routed. */
  ready: boolean;
}

const everyone = roles;
const readersOfKpis: readonly Role[] = ['admin', 'engineer', 'manager'];

export const pages = [
  { id: 'dashboard', path: '/', label: 'Dashboard', roles: everyone, ready: true },
  { id: 'reliability', path: '/reliability', label: 'Reliability', roles: readersOfKpis, ready: true },
  { id: 'element-life', path: '/element-life', label: 'Element life & forecast', roles: everyone, ready: true },
  { id: 'time-to-complete', path: '/time-to-complete', label: 'Jobs / time to complete', roles: readersOfKpis, ready: true },
  { id: 'downtime', path: '/downtime', label: 'Downtime', roles: everyone, ready: true },
  { id: 'performance', path: '/performance', label: 'Membrane performance', roles: readersOfKpis, ready: true },
  { id: 'imports', path: '/imports', label: 'Imports', roles: ['admin', 'engineer'], ready: true },
  { id: 'reports', path: '/reports', label: 'Reports', roles: everyone, ready: true },
  { id: 'nightly', path: '/nightly', label: 'Nightly runs', roles: ['admin', 'engineer'], ready: true },
  { id: 'users', path: '/users', label: 'Users', roles: ['admin'], ready: true },
  { id: 'mail', path: '/mail', label: 'Mail', roles: ['admin'], ready: true },
  { id: 'settings', path: '/settings', label: 'Settings', roles: everyone, editRoles: ['admin'], ready: true },
] as const satisfies readonly PageEntry[];

export type PageId = (typeof pages)[number]['id'];

const table: readonly PageEntry[] = pages;

export function pageById(id: PageId): PageEntry {
  const page = table.find((p) => p.id === id);
  if (!page) throw new Error(`No page ${id} in the navigation table`);
  return page;
}

/** May this role open the page? */
export function canOpen(role: Role, id: PageId): boolean {
  return pageById(id).roles.includes(role);
}

/** May this role change what the page shows (a page without editRoles cannot be changed by anyone)? */
export function canEdit(role: Role, id: PageId): boolean {
  return pageById(id).editRoles?.includes(role) ?? false;
}

/** The navigation entries of a role, in table order: only the ready pages it may open. */
export function navigationFor(role: Role): PageEntry[] {
  return table.filter((p) => p.ready && p.roles.includes(role));
}
