// Query and answer of the element life KPI (GET /api/kpi/element-life, `osmia kpi element-life --json`).
import { z } from 'zod';

import { confidence, count, days, fraction, provenanceSchema, reasonsSchema } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

export const elementGroupByValues = ['all', 'train', 'stage', 'position', 'model'] as const;
export const elementGroupBySchema = z.enum(elementGroupByValues).default('all');

/** GET /api/kpi/element-life. */
export const elementLifeQuerySchema = windowQuerySchema.extend({ groupBy: elementGroupBySchema });
export type ElementLifeQuery = z.infer<typeof elementLifeQuerySchema>;

export const weibullSchema = z.object({
  shape: z.number().positive(),
  scaleDays: z.number().positive(),
  /** Interval limits at the query's confidence; an upper limit that does not close is null ('unbounded' in reasons). */
  shapeLower: z.number().nonnegative(),
  shapeUpper: z.number().positive().nullable(),
  scaleLowerDays: days,
  scaleUpperDays: z.number().positive().nullable(),
  logLik: z.number(),
  intervalMethod: z.enum(['likelihood-ratio', 'wald-log']),
});

export const kmPointSchema = z.object({
  tDays: days,
  survival: fraction,
  nRisk: count,
  nEvents: count,
  nCensored: count,
  /** Greenwood standard error; null once survival is 0. */
  se: z.number().nonnegative().nullable(),
  lower: fraction.nullable(),
  upper: fraction.nullable(),
});

const regressionLineSchema = z.object({ shape: z.number().positive(), scaleDays: z.number().positive() });

/** Group keys: `all`, `train=RO1`, `stage=RO1-S1`, `position=1`, `model=…`. */
export const elementGroupKeySchema = z.string().regex(/^(all|(train|stage|position|model)=.+)$/);

export const elementLifeGroupSchema = z.object({
  key: elementGroupKeySchema,
  /** Element lives in the group that overlap the window, and life-ending events among them in it. */
  n: count,
  events: count,
  /** Of the n lives, those begun before the window's start (entering at their age then). */
  enteredLate: count,
  weibull: weibullSchema.nullable(),
  b10Days: days.nullable(),
  medianDays: days.nullable(),
  meanDays: days.nullable(),
  kmMedianDays: days.nullable(),
  kmMedianLowerDays: days.nullable(),
  kmMedianUpperDays: days.nullable(),
  km: z.array(kmPointSchema),
  /** Median-rank regression (Bernard ranks), a cross-check of the fit. */
  medianRankRegression: z
    .object({ yOnX: regressionLineSchema, xOnY: regressionLineSchema, correlation: z.number().min(-1).max(1) })
    .nullable(),
  /** Present when a figure of the group is null. */
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

/** Provenance of an element answer: the serials used (at most PROVENANCE_CAP, shared/kpi/provenance.ts) and their number. */
export const elementProvenanceSchema = provenanceSchema.extend({
  elements: z.array(z.string()),
  elementCount: count,
});

export const elementLifeReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  /** The resolved window [from, to); null when there is no data to bound a default window. */
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  confidence,
  groupBy: z.enum(elementGroupByValues),
  groups: z.array(elementLifeGroupSchema),
  windowTreatment: windowTreatmentSchema,
  notes: z.array(z.string()),
  provenance: elementProvenanceSchema,
});
export type ElementLifeReport = z.infer<typeof elementLifeReportSchema>;
