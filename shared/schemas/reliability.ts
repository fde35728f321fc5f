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

const reliabilityFiguresSchema = z.object({
  /** Asset code; null for a whole site. */
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
  operationalAvailability: fraction.nullable().optional(),
  meanActiveRepairHours: hours.nullable().optional(),
  /** Asset codes whose failures count: the asset itself and every asset below it. */
  scope: z.array(z.string()).optional(),
  operatingTimeSource: operatingTimeSourceSchema.optional(),
  reasons: reasonsSchema.optional(),
});

export const reliabilityGroupSchema = reliabilityFiguresSchema.extend({ key: z.string() });

export const reliabilityReportSchema = reliabilityFiguresSchema.extend({
  site: z.string().optional(),
  ...freshnessShape,
  /** The resolved window [from, to); null when there is no data to bound a default window. */
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  confidence,
  /** How the MTBF bounds were computed; docs/design.md §6: two-sided, time-terminated. */
  sides: z.enum(['two-sided', 'one-sided-lower']).optional(),
  terminated: z.enum(['time', 'failure']).optional(),
  groups: z.array(reliabilityGroupSchema).optional(),
  /** How the operating time was made up: per top-level unit, its source and hours. */
  operatingTime: z
    .object({
      windowHours: hours,
      uptimeHours: hours,
      downtimeHours: hours,
      unknownHours: hours,
      units: z.array(z.object({ asset: z.string(), source: operatingTimeSourceSchema, tag: z.string().nullable().optional(), hours })),
    })
    .optional(),
  /** How each failure's restoration time was found. */
  mttrBasis: z.object({ outOfServiceWindow: count, completedLessReported: count, unknown: count }).optional(),
  notes: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type ReliabilityReport = z.infer<typeof reliabilityReportSchema>;
