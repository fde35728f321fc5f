// Query and answer of the forecast KPI (GET /api/kpi/forecast, `osmia kpi forecast --json`).
import { z } from 'zod';

import { confidence, count, days, fraction, provenanceSchema, reasonsSchema } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';
import { elementGroupBySchema, elementGroupByValues, elementGroupKeySchema, weibullSchema, windowTreatmentSchema } from './element-life.ts';

/** GET /api/kpi/forecast: the next `months` calendar months from `to` (or now), per group. */
export const forecastQuerySchema = windowQuerySchema.extend({
  groupBy: elementGroupBySchema,
  months: z.coerce.number().int().min(1).max(60).default(12),
  /** Count failures of the replacements too (default false: first events only, as docs/design.md §6). */
  renewal: z.union([z.boolean(), z.stringbool()]).default(false),
});
export type ForecastQuery = z.infer<typeof forecastQuerySchema>;

const forecastFiguresSchema = z.object({
  expectedCount: z.number().nonnegative(),
  expectedCost: z.number().nonnegative(),
  countLower: z.number().nonnegative().nullable(),
  countUpper: z.number().nonnegative().nullable(),
  costLower: z.number().nonnegative().nullable(),
  costUpper: z.number().nonnegative().nullable(),
});

export const forecastMonthSchema = forecastFiguresSchema.extend({
  /** e.g. `2026-04`. */
  label: z.string(),
  from: isoInstantSchema,
  to: isoInstantSchema,
  /** The rest of the month the forecast starts in. */
  partial: z.boolean().optional(),
});

export const forecastGroupSchema = z.object({
  key: elementGroupKeySchema,
  /** Elements in service at `asOf`. */
  inService: count,
  weibull: weibullSchema.nullable(),
  months: z.array(forecastMonthSchema),
  total: forecastFiguresSchema,
  elements: z.array(z.object({ serial: z.string(), ageDays: days, probability: fraction })).optional(),
  reasons: reasonsSchema.optional(),
  /** 'own' fit of the group, or the pooled fit of every life in scope when the group has none. */
  fitSource: z.string().optional(),
});

export const forecastReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  asOf: isoInstantSchema,
  confidence,
  groupBy: z.enum(elementGroupByValues),
  currency: z.string().optional(),
  renewal: z.boolean(),
  /** How the lower/upper band was obtained. */
  bandMethod: z.string(),
  groups: z.array(forecastGroupSchema),
  /** Sum over groups per month (bands do not add up across groups, so none is given here). */
  totals: z.array(
    z.object({
      label: z.string(),
      from: isoInstantSchema,
      to: isoInstantSchema,
      expectedCount: z.number().nonnegative(),
      expectedCost: z.number().nonnegative(),
    }),
  ),
  /**
   * Elements in service at the forecast start (the window's end `to`: installed before it, not
   * removed before it, however long before the window they were installed), forecast or not.
   */
  inService: count.optional(),
  /** How the lives of the fits were taken from the window (see windowTreatmentSchema). */
  windowTreatment: windowTreatmentSchema.optional(),
  notes: z.array(z.string()).optional(),
  /** Replacing elements means opening pressure vessels: the usual cautions (shared/cautions.ts). */
  cautions: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type ForecastReport = z.infer<typeof forecastReportSchema>;
