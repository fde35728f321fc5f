import { openWorkOrdersQuerySchema, openWorkOrdersRoles, openWorkOrdersSchema } from '#shared/schemas/work-orders.ts';
import type { AppDeps } from '../deps.ts';
import { getOpenWorkOrders } from '../services/open-work.ts';
import type { RouteRegistry } from './registry.ts';

export function workOrderRoutes(r: RouteRegistry, { db }: AppDeps) {
  r.get(
    '/api/work-orders/open',
    {
      access: openWorkOrdersRoles,
      summary: 'Work orders open at the end of the window (or of the data): overdue first, with the backlog hours',
      query: openWorkOrdersQuerySchema,
      response: openWorkOrdersSchema,
    },
    async (req, res) => {
      const query = openWorkOrdersQuerySchema.parse(req.query);
      res.json(await getOpenWorkOrders(db, query));
    },
  );
}
