// Open work: the work orders not done at an instant, which of them are overdue, and the backlog
// hours they carry. Pure: the orders and the instant come in, the answer of GET /api/work-orders/open goes out.
import type { WorkOrderPriority } from '../schemas/enums.ts';
import type { OpenWorkOrder, OpenWorkOrders } from '../schemas/work-orders.ts';
import type { WorkOrderRecord } from './work-orders.ts';

const DAY_MS = 86_400_000;

/**
 * Age past which an open order is overdue, days, by priority. Work orders carry no due date here,
 * so age against a response target per priority stands in for one (Osmia's defaults: emergency
 * 1 d, high 7 d, medium 30 d, low 90 d).
 */
export const overdueAfterDays: Record<WorkOrderPriority, number> = { emergency: 1, high: 7, medium: 30, low: 90 };

const priorityRank: Record<WorkOrderPriority, number> = { emergency: 0, high: 1, medium: 2, low: 3 };

/** What the open-work rules read of a work order. */
export type OpenWorkInput = Pick<
  WorkOrderRecord,
  'woNumber' | 'asset' | 'type' | 'priority' | 'status' | 'description' | 'reportedAt' | 'completedAt' | 'labourHours'
>;

/** One open order of the answer (shared/schemas/work-orders.ts), its reported time still a Date. */
export type OpenWorkItem = Omit<OpenWorkOrder, 'reportedAt'> & { reportedAt: Date };

export type OpenWorkSummary = Pick<OpenWorkOrders, 'total' | 'overdue' | 'hours' | 'withoutEstimate'> & {
  /** Every open order: overdue first, then by priority, then oldest first, then by number. */
  orders: OpenWorkItem[];
};

/**
 * The orders open at `asOf`: not cancelled, reported before it and not completed before it (the
 * maintenance mix's backlog at its window end, shared/kpi/maintenance-mix.ts, counts the same
 * orders). Age = asOf − reported, days; overdue when the age exceeds `overdueAfterDays` of its
 * priority. Hours = Σ labour hours of the open orders (0 for an order without an estimate, counted in
 * `withoutEstimate`). No order gives zeros and an empty list.
 */
export function openWork(orders: readonly OpenWorkInput[], asOf: Date): OpenWorkSummary {
  const at = asOf.getTime();
  const open = orders
    .filter((o) => o.status !== 'cancelled' && o.reportedAt.getTime() < at && (o.completedAt === null || o.completedAt.getTime() >= at))
    .map((o): OpenWorkItem => {
      const ageDays = (at - o.reportedAt.getTime()) / DAY_MS;
      return {
        woNumber: o.woNumber,
        asset: o.asset,
        type: o.type,
        priority: o.priority,
        status: o.status,
        description: o.description,
        reportedAt: o.reportedAt,
        labourHours: o.labourHours,
        ageDays,
        overdue: ageDays > overdueAfterDays[o.priority],
      };
    })
    .sort(
      (a, b) =>
        Number(b.overdue) - Number(a.overdue) ||
        priorityRank[a.priority] - priorityRank[b.priority] ||
        a.reportedAt.getTime() - b.reportedAt.getTime() ||
        a.woNumber.localeCompare(b.woNumber),
    );
  return {
    total: open.length,
    overdue: open.filter((o) => o.overdue).length,
    hours: open.reduce((acc, o) => acc + o.labourHours, 0),
    withoutEstimate: open.filter((o) => o.labourHours === 0).length,
    orders: open,
  };
}

/** What the open-work answer is built from, as server/services/open-work.ts reads it. */
export interface OpenWorkOrdersInput {
  site: string;
  /** The asset asked about; null for the whole site. */
  asset: string | null;
  /** The work orders on the asset and everything below it (the whole site without one) that may be open at the instant. */
  workOrders: readonly OpenWorkInput[];
}

/**
 * GET /api/work-orders/open: the orders open at `asOf` (`openWork`), their counts and backlog hours
 * over every open order, and the `limit` most pressing of them listed. Degenerate input: no order →
 * zeros and an empty list.
 */
export function buildOpenWorkOrders(input: OpenWorkOrdersInput, at: { asOf: Date; limit: number }): OpenWorkOrders {
  const summary = openWork(input.workOrders, at.asOf);
  return {
    site: input.site,
    ...(input.asset === null ? {} : { asset: input.asset }),
    asOf: at.asOf.toISOString(),
    total: summary.total,
    overdue: summary.overdue,
    hours: summary.hours,
    withoutEstimate: summary.withoutEstimate,
    overdueAfterDays,
    workOrders: summary.orders.slice(0, at.limit).map((o) => ({ ...o, reportedAt: o.reportedAt.toISOString() })),
  };
}
