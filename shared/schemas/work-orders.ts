import { z } from 'zod';
import { isoDateOrDateTimeSchema, isoInstantSchema } from './common.ts';
import { workOrderPriorities, workOrderStatuses, workOrderTypes, type Role } from './enums.ts';

/** Who may list open work orders (GET /api/work-orders/open): the people who plan and run the work. */
export const openWorkOrdersRoles: readonly Role[] = ['admin', 'engineer', 'manager'];

/**
 * GET /api/work-orders/open: the work orders open at `to` (default: the end of the site's data) on
 * the asset and everything below it (the whole site without an asset); `limit` caps the list, not
 * the counts.
 */
export const openWorkOrdersQuerySchema = z.object({
  site: z.string().trim().min(1).optional(),
  asset: z.string().trim().min(1).optional(),
  to: isoDateOrDateTimeSchema.optional(),
  limit: z.coerce.number({ error: 'limit must be a whole number from 1 to 100.' }).int().min(1).max(100).default(10),
});
export type OpenWorkOrdersQuery = z.infer<typeof openWorkOrdersQuerySchema>;

export const openWorkOrderSchema = z.object({
  woNumber: z.string(),
  asset: z.string(),
  type: z.enum(workOrderTypes),
  priority: z.enum(workOrderPriorities),
  status: z.enum(workOrderStatuses),
  description: z.string(),
  reportedAt: isoInstantSchema,
  /** Days from reported to `asOf`. */
  ageDays: z.number().nonnegative(),
  /** Labour hours booked or estimated on the order: what it adds to the backlog. */
  labourHours: z.number().nonnegative(),
  overdue: z.boolean(),
});
export type OpenWorkOrder = z.infer<typeof openWorkOrderSchema>;

export const openWorkOrdersSchema = z.object({
  site: z.string(),
  asset: z.string().optional(),
  /** The instant the orders are open at. */
  asOf: isoInstantSchema,
  /** Open orders, overdue ones and the backlog hours they carry: of every open order, not only the listed ones. */
  total: z.number().int().nonnegative(),
  overdue: z.number().int().nonnegative(),
  hours: z.number().nonnegative(),
  withoutEstimate: z.number().int().nonnegative(),
  /** Age in days past which an open order of each priority counts as overdue. */
  overdueAfterDays: z.object({ emergency: z.number(), high: z.number(), medium: z.number(), low: z.number() }),
  /** Overdue first, then by priority, then oldest first; at most `limit`. */
  workOrders: z.array(openWorkOrderSchema),
});
export type OpenWorkOrders = z.infer<typeof openWorkOrdersSchema>;
