// Query and answer of the maintenance mix KPI (GET /api/kpi/maintenance-mix, `osmia kpi maintenance-mix --json`).
import { z } from 'zod';

import { count, fraction, hours, m3, money, provenanceSchema, reason } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

/** GET /api/kpi/maintenance-mix: `asset` limits the work orders to that asset and the assets below it. */
export const maintenanceMixQuerySchema = windowQuerySchema.extend({
  /** Count cancelled preventive orders as missed PMs (default: they leave the denominator). */
  cancelledPmCountsAsMissed: z.union([z.boolean(), z.stringbool()]).default(false),
});
export type MaintenanceMixQuery = z.infer<typeof maintenanceMixQuerySchema>;

export const labourMixSchema = z.object({
  plannedHours: hours,
  reactiveHours: hours,
  improvementHours: hours,
  totalHours: hours,
  /** Shares of totalHours, 0–1; null when no hours were booked. */
  plannedShare: fraction.nullable(),
  reactiveShare: fraction.nullable(),
  improvementShare: fraction.nullable(),
  reason,
  /** Closed work orders completed in the window whose hours and costs are counted. */
  workOrders: z.array(z.string()),
});

export const pmComplianceSchema = z.object({
  definition: z.string(),
  /** Preventive orders raised in the window (cancelled included). */
  raised: count,
  cancelled: count,
  /** The denominator. */
  due: count,
  completedInWindow: count,
  /** completedInWindow / due, 0–1; null when nothing was due. */
  compliance: fraction.nullable(),
  reason,
  completed: z.array(z.string()),
  missed: z.array(z.string()),
});

export const backlogSchema = z.object({
  /** Work orders open at the window end (raised before it, not completed before it, not cancelled). */
  workOrders: count,
  hours,
  /** Orders in the backlog with no labour-hour estimate (0 h): the backlog hours understate the work. */
  withoutEstimate: count,
  crewCapacityHoursPerWeek: z.number().nonnegative().nullable(),
  /** hours / weekly capacity; null without a positive capacity. */
  weeks: z.number().nonnegative().nullable(),
  reason,
  list: z.array(z.string()),
});

export const maintenanceCostSchema = z.object({
  labourCost: money,
  partsCost: money,
  totalCost: money,
  producedM3: m3.nullable(),
  /** totalCost / producedM3; null without production. */
  costPerM3: money.nullable(),
  reason,
});

export const maintenanceMixReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  asset: z.string().optional(),
  from: isoInstantSchema,
  to: isoInstantSchema,
  labour: labourMixSchema,
  pmCompliance: pmComplianceSchema,
  backlog: backlogSchema,
  cost: maintenanceCostSchema,
  currency: z.string(),
  notes: z.array(z.string()),
  provenance: provenanceSchema,
});
export type MaintenanceMixReport = z.infer<typeof maintenanceMixReportSchema>;
