// A work order as the KPI rules read it (docs/design.md §4, work_orders): the register's row with its
// asset named by code. Each rule takes the fields it needs (`Pick<WorkOrderRecord, …>`), so the
// services map a row once, the same way for every KPI (server/services/work-orders.ts).
import type { WorkOrderPriority, WorkOrderStatus, WorkOrderType } from '../schemas/enums.ts';

export interface WorkOrderRecord {
  woNumber: string;
  /** Code of the asset the order is on. */
  asset: string;
  type: WorkOrderType;
  priority: WorkOrderPriority;
  status: WorkOrderStatus;
  failureCode: string | null;
  description: string;
  reportedAt: Date;
  startedAt: Date | null;
  completedAt: Date | null;
  /** Both set or both null (docs/design.md §5). */
  outOfServiceFrom: Date | null;
  outOfServiceTo: Date | null;
  /** Booked labour hours of a closed order; the estimate of an open one. */
  labourHours: number;
  labourCost: number;
  partsCost: number;
  crew: string | null;
}

/**
 * A failure (docs/design.md §6): a corrective work order with a failure code, not cancelled. The one
 * rule MTBF counts by and the engineer workbook lists by. Type and status may be a row's text.
 */
export function isFailure(wo: { type: string; status: string; failureCode: string | null }): boolean {
  return wo.type === 'corrective' && wo.status !== 'cancelled' && (wo.failureCode ?? '').trim() !== '';
}
