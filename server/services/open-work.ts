// Open work orders at an instant (the end of the site's data unless the query names one): which are
// open, which overdue, and the backlog hours they carry — rows through db/queries, then shared/kpi/open-work.ts.
import { openWork, overdueAfterDays } from '#shared/kpi/open-work.ts';
import type { WorkOrderPriority, WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import type { OpenWorkOrders, OpenWorkOrdersQuery } from '#shared/schemas/work-orders.ts';
import type { Db } from '../db/client.ts';
import { listWorkOrdersOpenAt } from '../db/queries/work-orders.ts';
import { resolveScope } from './scope.ts';

/**
 * GET /api/work-orders/open. `asOf` is the query's `to`, else the end of the site's data (samples
 * and work orders, as the KPI windows default to), else now for a site without data; so the counts
 * agree with the maintenance mix's backlog for the same window.
 */
export async function getOpenWorkOrders(db: Db, query: OpenWorkOrdersQuery): Promise<OpenWorkOrders> {
  const scope = await resolveScope(db, { site: query.site, asset: query.asset, to: query.to, confidence: 0.9 });
  // The service may read the clock; only shared/ may not.
  const asOf = scope.to ?? new Date();
  const codes = new Map(scope.assets.map((a) => [a.id, a.code]));
  const rows = await listWorkOrdersOpenAt(
    db.$client,
    scope.site.id,
    scope.inScope.map((a) => a.id),
    asOf,
  );
  const summary = openWork(
    rows.map((r) => ({
      woNumber: r.woNumber,
      asset: codes.get(r.assetId) ?? String(r.assetId),
      type: r.type as WorkOrderType,
      priority: r.priority as WorkOrderPriority,
      status: r.status as WorkOrderStatus,
      description: r.description,
      reportedAt: r.reportedAt,
      completedAt: r.completedAt,
      labourHours: r.labourHours,
    })),
    asOf,
  );
  return {
    site: scope.site.code,
    ...(scope.asset ? { asset: scope.asset.code } : {}),
    asOf: asOf.toISOString(),
    total: summary.total,
    overdue: summary.overdue,
    hours: summary.hours,
    withoutEstimate: summary.withoutEstimate,
    overdueAfterDays,
    workOrders: summary.orders.slice(0, query.limit).map((o) => ({ ...o, reportedAt: o.reportedAt.toISOString() })),
  };
}
