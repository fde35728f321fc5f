// Work-order rows as the shared KPI rules take them (shared/kpi/work-orders.ts): one mapping for every
// service that reads work orders, so the rows of one query mean the same to every KPI.
import type { WorkOrderRecord } from '#shared/kpi/work-orders.ts';
import type { WorkOrderPriority, WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import type { WorkOrderValues } from '../db/queries/work-orders.ts';

/**
 * The rows with their asset named by code. Type, priority and status are the database's text, which
 * its check constraints hold to the lists of shared/schemas/enums.ts. Every row is on one of `assets`
 * (the queries select by the ids of a site's assets).
 */
export function workOrderRecords(rows: readonly WorkOrderValues[], assets: readonly AssetRecord[]): WorkOrderRecord[] {
  const codes = new Map(assets.map((a) => [a.id, a.code]));
  return rows.map((r) => ({
    woNumber: r.woNumber,
    asset: codes.get(r.assetId)!,
    type: r.type as WorkOrderType,
    priority: r.priority as WorkOrderPriority,
    status: r.status as WorkOrderStatus,
    failureCode: r.failureCode,
    description: r.description,
    reportedAt: r.reportedAt,
    startedAt: r.startedAt,
    completedAt: r.completedAt,
    outOfServiceFrom: r.outOfServiceFrom,
    outOfServiceTo: r.outOfServiceTo,
    labourHours: r.labourHours,
    labourCost: r.labourCost,
    partsCost: r.partsCost,
    crew: r.crew,
  }));
}
