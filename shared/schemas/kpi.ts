// Answers and queries of the KPI endpoints reliability, element-life, forecast and
// time-to-complete (GET /api/kpi/<name>, `osmia kpi <name> --json`). Key names are docs/design.md §7's:
// camelCase with a unit suffix; the keys listed there may not be renamed, further keys may be added.
// Performance and downtime live in kpi-ops.ts.
import { z } from 'zod';

import type { OperatingTimeSource } from '#shared/kpi/operating-time.ts';

import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

/** Why a KPI value is null (never NaN or Infinity); sentences in shared/kpi/stats.ts. */
export const nullReasons = [
  'no-data',
  'no-failures',
  'no-events',
  'no-operating-time',
  'no-repairs',
  'no-time',
  'too-few-values',
  'too-few-events',
  'shape-diverges',
  'survival-zero',
  'not-reached',
  'unbounded',
  'no-jobs',
  'no-fit',
] as const;
export type NullReason = (typeof nullReasons)[number];
export const nullReasonSchema = z.enum(nullReasons);

/** For each null figure of an answer, why it is null: `{ "mtbfHours": "no-failures" }`. */
const reasonsSchema = z.record(z.string(), nullReasonSchema);

export const quantileMethodType7 = 'type7 (Hyndman & Fan 1996; R default)' as const;

/** Where operating time T came from (docs/design.md §6), as shared/kpi/operating-time.ts names it. */
export const operatingTimeSources = [
  'run-status',
  'ancestor-run-status',
  'calendar-less-out-of-service',
] as const satisfies readonly OperatingTimeSource[];
export const operatingTimeSourceSchema = z.enum(operatingTimeSources);

const hours = z.number().nonnegative();
const days = z.number().nonnegative();
const fraction = z.number().min(0).max(1);
const count = z.number().int().nonnegative();
const confidence = z.number().gt(0).lt(1);

/** What a number was computed from, so any figure can be explained (docs/design.md §6, last paragraph). */
export const provenanceSchema = z.object({
  /** External work-order numbers used. */
  workOrders: z.array(z.string()),
  /** Historian tags used. */
  tags: z.array(z.string()),
  /** Time windows used (the KPI window, out-of-service windows, …), ISO instants. */
  windows: z.array(
    z.object({
      from: isoInstantSchema,
      to: isoInstantSchema,
      what: z.string().optional(),
    }),
  ),
  /** Element serial numbers used (element-life, forecast). */
  elements: z.array(z.string()).optional(),
  /** Import ids whose rows were used. */
  imports: z.array(z.union([z.string(), z.number()])).optional(),
  /** Totals when a list above was capped. */
  elementCount: count.optional(),
  workOrderCount: count.optional(),
  /** Trains whose data was used (maintenance mix: produced volume). */
  trains: z.array(z.string()).optional(),
});
export type Provenance = z.infer<typeof provenanceSchema>;

// ---------------------------------------------------------------------------------------------
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

// ---------------------------------------------------------------------------------------------
// Element life

export const elementGroupByValues = ['all', 'train', 'stage', 'position', 'model'] as const;
export const elementGroupBySchema = z.enum(elementGroupByValues).default('all');

/** GET /api/kpi/element-life. */
export const elementLifeQuerySchema = windowQuerySchema.extend({ groupBy: elementGroupBySchema });
export type ElementLifeQuery = z.infer<typeof elementLifeQuerySchema>;

export const weibullSchema = z.object({
  shape: z.number().positive(),
  scaleDays: z.number().positive(),
  shapeLower: z.number().nonnegative().optional(),
  shapeUpper: z.number().positive().nullable().optional(),
  scaleLowerDays: days.optional(),
  scaleUpperDays: z.number().positive().nullable().optional(),
  logLik: z.number().optional(),
  intervalMethod: z.enum(['likelihood-ratio', 'wald-log']).optional(),
});

export const kmPointSchema = z.object({
  tDays: days,
  survival: fraction,
  nRisk: count.optional(),
  nEvents: count.optional(),
  nCensored: count.optional(),
  /** Greenwood standard error; null once survival is 0. */
  se: z.number().nonnegative().nullable().optional(),
  lower: fraction.nullable().optional(),
  upper: fraction.nullable().optional(),
});

const regressionLineSchema = z.object({ shape: z.number().positive(), scaleDays: z.number().positive() });

/** Group keys: `all`, `train=RO1`, `stage=RO1-S1`, `position=1`, `model=…`. */
const elementGroupKeySchema = z.string().regex(/^(all|(train|stage|position|model)=.+)$/);

export const elementLifeGroupSchema = z.object({
  key: elementGroupKeySchema,
  /** Element lives in the group that overlap the window, and life-ending events among them in it. */
  n: count,
  events: count,
  /** Of the n lives, those begun before the window's start (entering at their age then). */
  enteredLate: count.optional(),
  weibull: weibullSchema.nullable(),
  b10Days: days.nullable(),
  medianDays: days.nullable(),
  meanDays: days.nullable(),
  kmMedianDays: days.nullable().optional(),
  kmMedianLowerDays: days.nullable().optional(),
  kmMedianUpperDays: days.nullable().optional(),
  km: z.array(kmPointSchema),
  /** Median-rank regression (Bernard ranks), a cross-check of the fit. */
  medianRankRegression: z
    .object({ yOnX: regressionLineSchema, xOnY: regressionLineSchema, correlation: z.number().min(-1).max(1) })
    .nullable()
    .optional(),
  reasons: reasonsSchema.optional(),
});

/**
 * How element lives crossing the window's edges were treated (element-life, forecast). Every life
 * overlapping [from, to) is used. `enteredLate`: lives begun before `from` and still in service then;
 * each enters at its age at `from` (delayed entry / left truncation: at risk only from that age, the
 * Weibull likelihood conditioned on survival to it). `censoredAtEnd`: lives still in service at `to`,
 * or removed at or after it, right-censored at their age at `to`. Lives removed before `from` are
 * left out. `text`: the same as a sentence (also the first of `notes`).
 */
export const windowTreatmentSchema = z.object({
  enteredLate: count,
  censoredAtEnd: count,
  text: z.string(),
});

export const elementLifeReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  from: isoInstantSchema.nullable().optional(),
  to: isoInstantSchema.nullable().optional(),
  confidence: confidence.optional(),
  groupBy: z.enum(elementGroupByValues).optional(),
  groups: z.array(elementLifeGroupSchema),
  windowTreatment: windowTreatmentSchema.optional(),
  notes: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type ElementLifeReport = z.infer<typeof elementLifeReportSchema>;

// ---------------------------------------------------------------------------------------------
// Forecast

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

// ---------------------------------------------------------------------------------------------
// Time to complete

export const timeToCompleteGroupByValues = ['all', 'guided', 'crew', 'procedure'] as const;

/** GET /api/kpi/time-to-complete. groupBy limits the groups listed beyond `all` (default: every kind). */
export const timeToCompleteQuerySchema = windowQuerySchema.extend({
  groupBy: z.enum(timeToCompleteGroupByValues).optional(),
});
export type TimeToCompleteQuery = z.infer<typeof timeToCompleteQuerySchema>;

export const timeToCompleteGroupSchema = z.object({
  key: z.string().regex(/^(all|guided=(yes|no)|crew=.+|procedure=.+)$/),
  n: count,
  meanHours: hours.nullable(),
  medianHours: hours.nullable(),
  p90Hours: hours.nullable(),
  sdHours: hours.nullable().optional(),
  minHours: hours.nullable().optional(),
  maxHours: hours.nullable().optional(),
  reason: nullReasonSchema.optional(),
});

export const jobSchema = z.object({
  woNumber: z.string(),
  startedAt: isoInstantSchema,
  completedAt: isoInstantSchema,
  hours: z.number().positive(),
  guided: z.boolean(),
  steps: z.number().int().positive().optional(),
  crew: z.string().nullable().optional(),
  procedure: z.string().nullable().optional(),
});

const learningBucketSchema = z.object({
  label: z.string(),
  start: isoInstantSchema.nullable(),
  end: isoInstantSchema.nullable(),
  firstJob: z.number().int().positive().optional(),
  lastJob: z.number().int().positive().optional(),
  n: count,
  medianHours: hours.nullable(),
  meanHours: hours.nullable(),
});

export const timeToCompleteReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  from: isoInstantSchema.nullable().optional(),
  to: isoInstantSchema.nullable().optional(),
  quantileMethod: z.literal(quantileMethodType7),
  groups: z.array(timeToCompleteGroupSchema),
  jobs: z.array(jobSchema),
  skipped: z
    .array(z.object({ woNumber: z.string(), reason: z.enum(['non-positive-duration', 'invalid-time']) }))
    .optional(),
  learningCurve: z
    .object({ byPeriod: z.array(learningBucketSchema), bySequence: z.array(learningBucketSchema) })
    .optional(),
  /** How a job's procedure is named. */
  procedureDefinition: z.string().optional(),
  /** Element-replacement jobs are vessel work: the usual cautions (shared/cautions.ts). */
  cautions: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type TimeToCompleteReport = z.infer<typeof timeToCompleteReportSchema>;
