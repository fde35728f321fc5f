// Query and answer of the performance KPI (GET /api/kpi/performance, `osmia kpi performance --json`).
import { z } from 'zod';

import { count, provenanceSchema, reason } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

export const feedBrineAverages = ['log-mean', 'arithmetic'] as const;

/** GET /api/kpi/performance: `asset` is a train (every stage below it) or a stage. */
export const performanceQuerySchema = windowQuerySchema.extend({
  /** Feed-brine average concentration; log-mean is ASTM D4516's primary form. */
  feedBrineAverage: z.enum(feedBrineAverages).default('log-mean'),
  /** Apply the viscosity term 1 + 0.017(T − 25) to normalized ΔP (a variant; off by default). */
  viscosityCorrection: z.union([z.boolean(), z.stringbool()]).default(false),
  /** summary: each daily point keeps the figures a chart needs; full: every intermediate of every point. */
  detail: z.enum(['summary', 'full']).default('summary'),
});
export type PerformanceQuery = z.infer<typeof performanceQuerySchema>;

export const performanceSettingsSchema = z.object({
  tdsFactor: z.number().positive(),
  osmoticBarPerMgL: z.number().positive(),
  uBelow25K: z.number().positive(),
  uAtOrAbove25K: z.number().positive(),
  feedBrineAverage: z.enum(feedBrineAverages),
  dpFlowExponent: z.number().positive(),
  dpViscosityCorrection: z.boolean(),
  dpViscosityPerC: z.number().nonnegative(),
  flowDropPct: z.number().positive(),
  dpRisePct: z.number().positive(),
  saltPassageRisePct: z.number().positive(),
});

/** Every intermediate of one operating point (bar, m³/h, mg/L, °C, %). */
export const stageStateSchema = z.object({
  time: isoInstantSchema,
  recovery: z.number().gt(0).lt(1),
  concentrateFlowM3h: z.number().positive(),
  measuredConcentrateFlowM3h: z.number().nonnegative().nullable(),
  concentrateFlowGapPct: z.number().nullable(),
  feedTdsMgL: z.number().positive(),
  permeateTdsMgL: z.number().nonnegative(),
  concentrateTdsMgL: z.number(),
  feedBrineTdsMgL: z.number(),
  feedBrineAverage: z.enum(feedBrineAverages),
  osmoticFeedBrineBar: z.number(),
  osmoticPermeateBar: z.number().nonnegative(),
  differentialPressureBar: z.number().nonnegative(),
  netDrivingPressureBar: z.number(),
  tcf: z.number().positive(),
  tempC: z.number(),
  permeateFlowM3h: z.number().positive(),
  saltPassagePct: z.number().nonnegative(),
  averageFeedBrineFlowM3h: z.number().positive(),
});

export const normalizedValuesSchema = z.object({
  permeateFlowM3h: z.number().nullable(),
  saltPassagePct: z.number().nonnegative(),
  differentialPressureBar: z.number().nonnegative(),
  baselinePermeateFlowM3h: z.number().positive(),
  baselineSaltPassagePct: z.number().nonnegative(),
  baselineDifferentialPressureBar: z.number().nonnegative(),
  permeateFlowChangePct: z.number().nullable(),
  saltPassageChangePct: z.number(),
  differentialPressureChangePct: z.number(),
  nullReason: reason,
});

export const normalizedPointSchema = z.object({ state: stageStateSchema, normalized: normalizedValuesSchema });

/** Figures kept for each daily point with detail=summary (the default). */
export const summaryStateKeys = ['time', 'tempC'] as const;
export const summaryNormalizedKeys = [
  'permeateFlowM3h',
  'saltPassagePct',
  'differentialPressureBar',
  'permeateFlowChangePct',
  'saltPassageChangePct',
  'differentialPressureChangePct',
  'nullReason',
] as const;

/** A daily point of the series: every figure with detail=full, the summary keys otherwise. */
export const seriesPointSchema = z.object({
  state: stageStateSchema.partial().required(Object.fromEntries(summaryStateKeys.map((k) => [k, true])) as { [K in (typeof summaryStateKeys)[number]]: true }),
  normalized: normalizedValuesSchema
    .partial()
    .required(Object.fromEntries(summaryNormalizedKeys.map((k) => [k, true])) as { [K in (typeof summaryNormalizedKeys)[number]]: true }),
  runningHours: z.number().nonnegative().optional(),
});

export const performanceAlertSchema = z.object({
  kind: z.enum(['permeate-flow-drop', 'differential-pressure-rise', 'salt-passage-rise']),
  time: isoInstantSchema,
  since: isoInstantSchema,
  changePct: z.number(),
  thresholdPct: z.number().positive(),
  value: z.number(),
  baselineValue: z.number(),
  unit: z.enum(['m3/h', '%', 'bar']),
  message: z.string(),
  recommendation: z.string(),
  /** Safety cautions (shared/cautions.ts); never empty. */
  cautions: z.array(z.string()).min(1),
});

export const performanceBaselineSchema = z.object({
  /** Index in `points` of the first point at or after the baseline (0 when the baseline day is before the window). */
  index: count,
  /** The baseline day; it may lie before the window (the first running day after the last reset before it). */
  time: isoInstantSchema,
  reason: z.enum(['first-running-day', 'after-reset']),
  resetAt: isoInstantSchema.nullable(),
  state: stageStateSchema,
  /**
   * The event that set the baseline: a cleaning (its work order), an element change-out (how many elements;
   * single swaps below the settings' share do not reset it), or none — the first running day of the data.
   */
  setBy: z.object({
    kind: z.enum(['first-running-day', 'cleaning', 'element-change-out']),
    at: isoInstantSchema.nullable(),
    workOrder: z.string().nullable(),
    elements: count.nullable(),
  }),
});

/** One stage's series (ASTM D4516 standardizes stage by stage). */
export const performanceStageSchema = z.object({
  /** Stage asset code. */
  asset: z.string(),
  /** Train the stage belongs to, when known. */
  train: z.string().nullable().optional(),
  baseline: performanceBaselineSchema.nullable(),
  points: z.array(seriesPointSchema),
  latest: normalizedPointSchema.nullable(),
  alerts: z.array(performanceAlertSchema),
  settings: performanceSettingsSchema,
  notes: z.array(z.string()),
  /** Element changes and cleanings considered for the baseline. */
  resets: z.array(isoInstantSchema).optional(),
  runStatusTag: z.string().nullable().optional(),
  tags: z.array(z.string()).optional(),
  /** Quantities the stage has no tag for (then its figures are null). */
  missingQuantities: z.array(z.string()).optional(),
  reason: z.string().nullable().optional(),
});

export const performanceReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  stages: z.array(performanceStageSchema),
  notes: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type PerformanceReport = z.infer<typeof performanceReportSchema>;
