// Query and answer of the reliability KPI (GET /api/kpi/reliability, `osmia kpi reliability --json`).
import { z } from 'zod';

import type { OperatingTimeSource } from '#shared/kpi/operating-time.ts';

import { confidence, count, fraction, hours, provenanceSchema, reasonsSchema } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

/** Where operating time T came from (docs/design.md §6), as shared/kpi/operating-time.ts names it. */
export const operatingTimeSources = [
  'run-status',
  'ancestor-run-status',
  'calendar-less-out-of-service',
] as const satisfies readonly OperatingTimeSource[];
export const operatingTimeSourceSchema = z.enum(operatingTimeSources);

// Reliability

export const reliabilityGroupByValues = ['all', 'asset', 'kind'] as const;

/** GET /api/kpi/reliability. groupBy: all = one answer for the asset and everything below it,
 *  asset = also one per asset in that scope, kind = also one per asset kind. */
export const reliabilityQuerySchema = windowQuerySchema.extend({
  groupBy: z.enum(reliabilityGroupByValues).default('all'),
});
export type ReliabilityQuery = z.infer<typeof reliabilityQuerySchema>;

/** How the operating time of an answer or a group was made up: per unit (asset) summed, its source and hours. */
export const operatingTimeSchema = z.object({
  /** Length of the window, hours. */
  windowHours: hours,
  uptimeHours: hours,
  downtimeHours: hours,
  /** Hours of the window whose run state is not known (not counted). */
  unknownHours: hours,
  /** One per unit summed: the asset, or the top-level assets of the site, or the assets of a kind. */
  units: z.array(z.object({ asset: z.string(), source: operatingTimeSourceSchema, tag: z.string().nullable(), hours })),
});

/** How each failure's restoration time was found (docs/design.md §6 MTTR). */
export const mttrBasisSchema = z.object({ outOfServiceWindow: count, completedLessReported: count, unknown: count });

const reliabilityFiguresSchema = z.object({
  /** Asset code; null for a whole site or a kind group. */
  asset: z.string().nullable(),
  operatingHours: hours,
  failures: count,
  mtbfHours: hours.nullable(),
  mtbfLowerHours: hours.nullable(),
  mtbfUpperHours: hours.nullable(),
  /** Mean time to restoration. */
  mttrHours: hours.nullable(),
  /** Inherent availability MTBF/(MTBF+MTTR), 0–1; null when there are no failures. */
  availability: fraction.nullable(),
  /** Up time / (up time + all down time), 0–1. */
  operationalAvailability: fraction.nullable(),
  meanActiveRepairHours: hours.nullable(),
  /** Asset codes whose failures count: the asset itself and every asset below it. */
  scope: z.array(z.string()),
  /** The weakest source in the sum of operating time. */
  operatingTimeSource: operatingTimeSourceSchema,
  reasons: reasonsSchema,
  operatingTime: operatingTimeSchema,
  mttrBasis: mttrBasisSchema,
  /** How the figures were reached: fallbacks, data gaps, sums. */
  notes: z.array(z.string()),
});

export const reliabilityGroupSchema = reliabilityFiguresSchema.extend({ key: z.string() });

export const reliabilityReportSchema = reliabilityFiguresSchema.extend({
  site: z.string(),
  ...freshnessShape,
  /** Absent when there is no window (a site without data): no operating time was looked for. */
  operatingTimeSource: operatingTimeSourceSchema.optional(),
  /** The resolved window [from, to); null when there is no data to bound a default window. */
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  confidence,
  /** How the MTBF bounds were computed; docs/design.md §6: two-sided, time-terminated. */
  sides: z.enum(['two-sided', 'one-sided-lower']),
  terminated: z.enum(['time', 'failure']),
  /** One per asset or per kind with groupBy asset or kind; empty with groupBy all. */
  groups: z.array(reliabilityGroupSchema),
  provenance: provenanceSchema,
});
export type ReliabilityReport = z.infer<typeof reliabilityReportSchema>;
