// Query and answer of the forecast KPI (GET /api/kpi/forecast, `osmia kpi forecast --json`).
import { z } from 'zod';

import { confidence, count, days, fraction, reasonsSchema } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';
import {
  elementGroupBySchema,
  elementGroupByValues,
  elementGroupKeySchema,
  elementProvenanceSchema,
  weibullSchema,
  windowTreatmentSchema,
} from './element-life.ts';

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
  /** true for the rest of the month the forecast starts in (when it does not start on the 1st). */
  partial: z.boolean(),
});

export const forecastGroupSchema = z.object({
  key: elementGroupKeySchema,
  /** Elements in service at `asOf`. */
  inService: count,
  /** The fit used (a group without one is left out, and named in the notes). */
  weibull: weibullSchema,
  months: z.array(forecastMonthSchema),
  total: forecastFiguresSchema,
  /** The elements most likely to need replacing first, at most 500 (shared/kpi/forecast-report.ts). */
  elements: z.array(z.object({ serial: z.string(), ageDays: days, probability: fraction })),
  reasons: reasonsSchema.optional(),
  /** 'group': the group's own fit; 'pooled': the fit of every life in scope, as the group's own lives give none. */
  fitSource: z.enum(['group', 'pooled']),
});

export const forecastReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  asOf: isoInstantSchema,
  confidence,
  groupBy: z.enum(elementGroupByValues),
  currency: z.string(),
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
  inService: count,
  /** How the lives of the fits were taken from the window (see windowTreatmentSchema). */
  windowTreatment: windowTreatmentSchema,
  notes: z.array(z.string()),
  /** Replacing elements means opening pressure vessels: the usual cautions (shared/cautions.ts). */
  cautions: z.array(z.string()),
  provenance: elementProvenanceSchema,
});
export type ForecastReport = z.infer<typeof forecastReportSchema>;
