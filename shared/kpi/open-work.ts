// Open work: the work orders not done at an instant, which of them are overdue, and the backlog
// hours they carry. Pure: the orders and the instant come in, the summary goes out.
import type { WorkOrderPriority, WorkOrderStatus, WorkOrderType } from '../schemas/enums.ts';

const DAY_MS = 86_400_000;

/**
 * Age past which an open order is overdue, days, by priority. Work orders carry no due date here,
 * so age against a response target per priority stands in for one (Osmia's defaults: emergency
 * 1 d, high 7 d, medium 30 d, low 90 d).
 */
export const overdueAfterDays: Record<WorkOrderPriority, number> = { emergency: 1, high: 7, medium: 30, low: 90 };

const priorityRank: Record<WorkOrderPriority, number> = { emergency: 0, high: 1, medium: 2, low: 3 };

export interface OpenWorkInput {
  woNumber: string;
  asset: string;
  type: WorkOrderType;
  priority: WorkOrderPriority;
  status: WorkOrderStatus;
  description: string;
  reportedAt: Date;
  completedAt: Date | null;
  labourHours: number;
}

export interface OpenWorkItem extends Omit<OpenWorkInput, 'completedAt'> {
  ageDays: number;
  overdue: boolean;
}

export interface OpenWorkSummary {
  total: number;
  overdue: number;
  hours: number;
  withoutEstimate: number;
  /** Every open order: overdue first, then by priority, then oldest first, then by number. */
  orders: OpenWorkItem[];
}

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
    .map(({ completedAt: _completedAt, ...o }): OpenWorkItem => {
      const ageDays = (at - o.reportedAt.getTime()) / DAY_MS;
      return { ...o, ageDays, overdue: ageDays > overdueAfterDays[o.priority] };
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
