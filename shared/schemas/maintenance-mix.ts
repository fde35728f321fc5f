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
  plannedShare: fraction.nullable(),
  reactiveShare: fraction.nullable(),
  improvementShare: fraction.nullable(),
  reason,
  workOrders: z.array(z.string()),
});

export const pmComplianceSchema = z.object({
  definition: z.string(),
  raised: count,
  cancelled: count,
  due: count,
  completedInWindow: count,
  compliance: fraction.nullable(),
  reason,
  completed: z.array(z.string()),
  missed: z.array(z.string()),
});

export const backlogSchema = z.object({
  workOrders: count,
  hours,
  withoutEstimate: count,
  crewCapacityHoursPerWeek: z.number().nonnegative().nullable(),
  weeks: z.number().nonnegative().nullable(),
  reason,
  list: z.array(z.string()),
});

export const maintenanceCostSchema = z.object({
  labourCost: money,
  partsCost: money,
  totalCost: money,
  producedM3: m3.nullable(),
  costPerM3: money.nullable(),
  reason,
});

export const maintenanceMixReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  asset: z.string().optional(),
  from: isoInstantSchema,
  to: isoInstantSchema,
  labour: labourMixSchema,
  pmCompliance: pmComplianceSchema,
  backlog: backlogSchema,
  cost: maintenanceCostSchema,
  currency: z.string().optional(),
  notes: z.array(z.string()),
  provenance: provenanceSchema.optional(),
});
export type MaintenanceMixReport = z.infer<typeof maintenanceMixReportSchema>;
