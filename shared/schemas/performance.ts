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

/** Normalization constants and alert thresholds (defaults: shared/kpi/performance.ts). */
export const performanceSettingsSchema = z.object({
  /** TDS per unit conductivity, mg/L per µS/cm (common practice: 0.67). */
  tdsFactor: z.number().positive(),
  /** Osmotic pressure per mg/L TDS, bar (1 psi per 100 mg/L = 0.000689475729 bar per mg/L). */
  osmoticBarPerMgL: z.number().positive(),
  /** TCF constant U below 25 °C, kelvin (common practice for polyamide: 3020). */
  uBelow25K: z.number().positive(),
  /** TCF constant U at or above 25 °C, kelvin (common practice for polyamide: 2640). */
  uAtOrAbove25K: z.number().positive(),
  feedBrineAverage: z.enum(feedBrineAverages),
  /** Exponent of the average feed-brine flow ratio in normalized ΔP (1.5). */
  dpFlowExponent: z.number().positive(),
  /** Multiply normalized ΔP by the viscosity term 1 + k·(T − 25) (the variant; off by default). */
  dpViscosityCorrection: z.boolean(),
  /** k of that viscosity term, per °C (0.017). */
  dpViscosityPerC: z.number().nonnegative(),
  /** Alert when normalized permeate flow is this many % below the baseline or more (10). */
  flowDropPct: z.number().positive(),
  /** Alert when normalized ΔP is this many % above the baseline or more (15). */
  dpRisePct: z.number().positive(),
  /** Alert when normalized salt passage is this many % above the baseline or more (5). */
  saltPassageRisePct: z.number().positive(),
});

/** Every intermediate of one operating point (bar, m³/h, mg/L, °C, %). */
export const stageStateSchema = z.object({
  time: isoInstantSchema,
  recovery: z.number().gt(0).lt(1),
  /** Qc = Qf − Qp, m³/h. */
  concentrateFlowM3h: z.number().positive(),
  /** Measured Qc, m³/h, or null. */
  measuredConcentrateFlowM3h: z.number().nonnegative().nullable(),
  /** 100 · (measured Qc − (Qf − Qp)) / Qf; null without a concentrate meter. */
  concentrateFlowGapPct: z.number().nullable(),
  feedTdsMgL: z.number().positive(),
  permeateTdsMgL: z.number().nonnegative(),
  /** Cc from the salt balance, mg/L. */
  concentrateTdsMgL: z.number(),
  /** Feed-brine average concentration by the chosen method, mg/L. */
  feedBrineTdsMgL: z.number(),
  feedBrineAverage: z.enum(feedBrineAverages),
  osmoticFeedBrineBar: z.number(),
  osmoticPermeateBar: z.number().nonnegative(),
  /** ΔPfb = Pf − Pc, bar. */
  differentialPressureBar: z.number().nonnegative(),
  netDrivingPressureBar: z.number(),
  tcf: z.number().positive(),
  tempC: z.number(),
  permeateFlowM3h: z.number().positive(),
  /** SP = 100 · Cp / Cf, %. */
  saltPassagePct: z.number().nonnegative(),
  /** Qavg = (Qf + Qc)/2, m³/h. */
  averageFeedBrineFlowM3h: z.number().positive(),
});

export const normalizedValuesSchema = z.object({
  /** Qp,norm = Qp · (NDPref/NDP) · (TCF(T)/TCF(Tref)), m³/h at reference NDP and temperature; null when an NDP ≤ 0. */
  permeateFlowM3h: z.number().nullable(),
  /** SPnorm = SP · (Qp/Qp,ref) · (Cfb,ref/Cfb) · (Cf/Cf,ref), %. */
  saltPassagePct: z.number().nonnegative(),
  /** ΔPnorm = ΔP · (Qavg,ref/Qavg)^1.5 [· (1 + 0.017(T − 25)) in the viscosity variant], bar. */
  differentialPressureBar: z.number().nonnegative(),
  /** Baseline values the changes are measured against (Qp,ref; SPref; ΔPref [· viscosity term at Tref]). */
  baselinePermeateFlowM3h: z.number().positive(),
  baselineSaltPassagePct: z.number().nonnegative(),
  baselineDifferentialPressureBar: z.number().nonnegative(),
  /** 100 · (Qp,norm / Qp,ref − 1); null with the flow. */
  permeateFlowChangePct: z.number().nullable(),
  saltPassageChangePct: z.number(),
  differentialPressureChangePct: z.number(),
  /** Why permeateFlowM3h is null, else null. */
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
  /** Hours of the day the stage ran throughout, whose means the point is. */
  runningHours: z.number().nonnegative(),
});

export const performanceAlertSchema = z.object({
  kind: z.enum(['permeate-flow-drop', 'differential-pressure-rise', 'salt-passage-rise']),
  /** Time of the latest point, which crosses the threshold. */
  time: isoInstantSchema,
  /** First point of the unbroken run of crossing points that ends at the latest point. */
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
  /** The element change or cleaning the baseline follows; null for the first running day. */
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
  /** Train the stage belongs to; null when it is under none. */
  train: z.string().nullable(),
  baseline: performanceBaselineSchema.nullable(),
  points: z.array(seriesPointSchema),
  latest: normalizedPointSchema.nullable(),
  alerts: z.array(performanceAlertSchema),
  settings: performanceSettingsSchema,
  notes: z.array(z.string()),
  /** Element changes and cleanings considered for the baseline. */
  resets: z.array(isoInstantSchema),
  /** The run-status tag whose running hours the points average: the stage's own, else its train's; null without one. */
  runStatusTag: z.string().nullable(),
  /** The tags the stage's figures are computed from (run status first). */
  tags: z.array(z.string()),
  /** Quantities the stage has no tag for (then its figures are null). */
  missingQuantities: z.array(z.string()),
  /** Why the stage has no figures; null when it has them. */
  reason: z.string().nullable(),
});

export const performanceReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  stages: z.array(performanceStageSchema),
  notes: z.array(z.string()),
  provenance: provenanceSchema,
});
export type PerformanceReport = z.infer<typeof performanceReportSchema>;
