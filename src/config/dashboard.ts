import type { Role } from '#shared/schemas/enums.ts';
import { openWorkOrdersRoles } from '#shared/schemas/work-orders.ts';

// Dashboard cards that are not a page of the navigation table: who sees them. The KPI cards follow
// the roles of their page (config/navigation.ts); these follow their API's roles or their use.
const cardRoles = {
  /** GET /api/work-orders/open admits these roles (shared/schemas/work-orders.ts). */
  'open-work': openWorkOrdersRoles,
  /** Server and database status: for the people who run the server and its imports. */
  'server-health': ['admin', 'engineer'],
} as const satisfies Record<string, readonly Role[]>;

export type DashboardCard = keyof typeof cardRoles;

export function seesCard(role: Role, card: DashboardCard): boolean {
  return (cardRoles[card] as readonly Role[]).includes(role);
}
