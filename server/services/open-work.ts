// Open work orders at an instant (the end of the site's data unless the query names one): the rows
// through db/queries, then `buildOpenWorkOrders` (shared/kpi/open-work.ts) says which are open, which
// overdue, and the backlog hours they carry.
import { buildOpenWorkOrders } from '#shared/kpi/open-work.ts';
import type { OpenWorkOrders, OpenWorkOrdersQuery } from '#shared/schemas/work-orders.ts';
import type { Db } from '../db/client.ts';
import { listWorkOrdersOpenAt } from '../db/queries/work-orders.ts';
import { resolveScope } from './scope.ts';
import { workOrderRecords } from './work-orders.ts';

/**
 * GET /api/work-orders/open. `asOf` is the query's `to`, else the end of the site's data (samples
 * and work orders, as the KPI windows default to), else now for a site without data; so the counts
 * agree with the maintenance mix's backlog for the same window.
 */
export async function getOpenWorkOrders(db: Db, query: OpenWorkOrdersQuery): Promise<OpenWorkOrders> {
  const scope = await resolveScope(db, { site: query.site, asset: query.asset, to: query.to, confidence: 0.9 });
  // The service may read the clock; only shared/ may not.
  const asOf = scope.to ?? new Date();
  const rows = await listWorkOrdersOpenAt(
    db.$client,
    scope.site.id,
    scope.inScope.map((a) => a.id),
    asOf,
  );
  const input = { site: scope.site.code, asset: scope.asset?.code ?? null, workOrders: workOrderRecords(rows, scope.assets) };
  return buildOpenWorkOrders(input, { asOf, limit: query.limit });
}
