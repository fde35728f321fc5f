// Normalized membrane performance of one stage, ASTM D4516 style (docs/design.md §6).
//
// Sources, cited below as "(sources above)":
// - ASTM D4516 "Standard Practice for Standardizing Reverse Osmosis Performance Data": the standardized
//   permeate flow structure of its section 6.1 (read in a secondary summary of D4516-19a); the salt-passage
//   form follows the structure of its section 6.2 (from memory), consistent with solution-diffusion.
// - Log-mean feed-brine average and the ΔP flow exponent 1.5: as given on the UNSW DesalWiki page on ASTM
//   data normalisation (read). Arithmetic average and the ΔP viscosity term: variants in use.
// - Exponential TCF with U = 3020 K below 25 °C and 2640 K at or above: common practice for polyamide
//   membranes (from memory); TDS = 0.67 × conductivity and 1 psi per 100 mg/L TDS: common practice.
// - Cleaning triggers (flow −10 %, ΔP +15 %, salt passage +5–10 %): common practice.
//
// ASTM D4516 standardizes a brine-staged train stage by stage, so every function here works on one
// stage's series. The caller prepares the points (e.g. daily averages of running-only, good-quality
// samples, units converted on import: bar, m³/h, µS/cm, °C) and passes the candidate reset times
// (element changes and cleanings) used to pick the baseline.

import type { z } from 'zod';
import { maintenanceCautions } from '../cautions.ts';
import type {
  feedBrineAverages,
  normalizedPointSchema,
  normalizedValuesSchema,
  performanceAlertSchema,
  performanceBaselineSchema,
  performanceSettingsSchema,
  performanceStageSchema,
  stageStateSchema,
} from '../schemas/performance.ts';
import { agree, countOf } from '../text.ts';

/** One operating point of a stage. Pressures in bar (gauge), flows in m³/h, conductivities in µS/cm, °C. */
export interface PerformancePoint {
  /** Start of the averaging period (UTC instant). */
  time: Date;
  /** Feed pressure, bar. */
  pf: number;
  /** Concentrate pressure, bar. */
  pc: number;
  /** Permeate pressure, bar. */
  pp: number;
  /** Feed flow, m³/h. */
  qf: number;
  /** Permeate flow, m³/h. */
  qp: number;
  /** Measured concentrate flow, m³/h, if a meter exists (only reported against the mass balance). */
  qc?: number | null;
  /** Feed conductivity, µS/cm. */
  cf: number;
  /** Permeate conductivity, µS/cm. */
  cp: number;
  /** Feed temperature, °C. */
  tempC: number;
}

export type FeedBrineAverage = (typeof feedBrineAverages)[number];

/** Normalization constants and alert thresholds (shared/schemas/performance.ts says what each is). */
export type PerformanceSettings = z.infer<typeof performanceSettingsSchema>;

/**
 * Defaults. TDS factor, osmotic constant, U values, ΔP exponent and alert thresholds: common practice
 * (docs/design.md §6; sources above); 1 psi = 0.0689475729 bar (definition of the psi).
 */
export const defaultPerformanceSettings: PerformanceSettings = {
  tdsFactor: 0.67,
  osmoticBarPerMgL: 0.000689475729,
  uBelow25K: 3020,
  uAtOrAbove25K: 2640,
  feedBrineAverage: 'log-mean',
  dpFlowExponent: 1.5,
  dpViscosityCorrection: false,
  dpViscosityPerC: 0.017,
  flowDropPct: 10,
  dpRisePct: 15,
  saltPassageRisePct: 5,
};

/** bar per psi: 1 psi = 6894.757293168 Pa exactly (NIST SP 811 conversion factor). */
export const BAR_PER_PSI = 0.06894757293168;

/** Molar gas constant, J/(mol·K) (CODATA 2018, exact since the 2019 SI). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;

function finite(value: number, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new RangeError(`${what} must be a finite number, got ${String(value)}`);
  return value;
}

function positive(value: number, what: string): number {
  finite(value, what);
  if (value <= 0) throw new RangeError(`${what} must be > 0, got ${value}`);
  return value;
}

function nonNegative(value: number, what: string): number {
  finite(value, what);
  if (value < 0) throw new RangeError(`${what} must be ≥ 0, got ${value}`);
  return value;
}

/** Merges partial settings over the defaults and checks them. */
export function resolvePerformanceSettings(settings: Partial<PerformanceSettings> = {}): PerformanceSettings {
  const s: PerformanceSettings = { ...defaultPerformanceSettings, ...settings };
  positive(s.tdsFactor, 'settings.tdsFactor');
  positive(s.osmoticBarPerMgL, 'settings.osmoticBarPerMgL');
  positive(s.uBelow25K, 'settings.uBelow25K');
  positive(s.uAtOrAbove25K, 'settings.uAtOrAbove25K');
  positive(s.dpFlowExponent, 'settings.dpFlowExponent');
  nonNegative(s.dpViscosityPerC, 'settings.dpViscosityPerC');
  positive(s.flowDropPct, 'settings.flowDropPct');
  positive(s.dpRisePct, 'settings.dpRisePct');
  positive(s.saltPassageRisePct, 'settings.saltPassageRisePct');
  if (s.feedBrineAverage !== 'log-mean' && s.feedBrineAverage !== 'arithmetic') {
    throw new RangeError(`settings.feedBrineAverage must be 'log-mean' or 'arithmetic', got ${String(s.feedBrineAverage)}`);
  }
  if (typeof s.dpViscosityCorrection !== 'boolean') throw new RangeError('settings.dpViscosityCorrection must be a boolean');
  return s;
}

/**
 * Recovery Y = Qp/Qf (0–1). Source: ASTM D4516 terms (sources above).
 * Bad input (Qp ≤ 0, Qf ≤ Qp, non-finite) is an error: Y must lie strictly between 0 and 1 for the
 * feed-brine averages to exist.
 */
export function recovery(qpM3h: number, qfM3h: number): number {
  positive(qpM3h, 'permeate flow');
  positive(qfM3h, 'feed flow');
  if (qpM3h >= qfM3h) throw new RangeError(`permeate flow (${qpM3h}) must be below feed flow (${qfM3h}) m³/h`);
  return qpM3h / qfM3h;
}

/** TDS (mg/L) = factor × conductivity (µS/cm); common practice, default factor 0.67. Negative conductivity is an error. */
export function tdsFromConductivity(conductivityUsCm: number, tdsFactor = defaultPerformanceSettings.tdsFactor): number {
  nonNegative(conductivityUsCm, 'conductivity');
  positive(tdsFactor, 'tdsFactor');
  return conductivityUsCm * tdsFactor;
}

/**
 * Concentrate concentration from a salt balance, Cc = (Cf − Y·Cp)/(1 − Y), same unit as Cf.
 * Source: mass balance Qf·Cf = Qp·Cp + Qc·Cc with Y = Qp/Qf. Y outside (0, 1) is an error.
 */
export function concentrateConcentration(cf: number, cp: number, y: number): number {
  nonNegative(cf, 'feed concentration');
  nonNegative(cp, 'permeate concentration');
  if (!(y > 0 && y < 1)) throw new RangeError(`recovery must be between 0 and 1 (exclusive), got ${y}`);
  return (cf - y * cp) / (1 - y);
}

/**
 * Feed-brine average concentration, same unit as Cf.
 * Log-mean (primary): Cfb = Cf · ln(1/(1−Y)) / Y. Arithmetic: Cfb = (Cf + Cc)/2 with Cc from the salt balance.
 * Source: sources above (log-mean form as given on the UNSW DesalWiki ASTM
 * normalisation page; arithmetic variant). Y outside (0, 1) is an error.
 */
export function feedBrineConcentration(cf: number, cp: number, y: number, method: FeedBrineAverage = 'log-mean'): number {
  const cc = concentrateConcentration(cf, cp, y);
  if (method === 'arithmetic') return (cf + cc) / 2;
  return (cf * Math.log(1 / (1 - y))) / y;
}

/**
 * Osmotic pressure from TDS by the linear rule π = k·TDS, bar; default k = 1 psi per 100 mg/L
 * (0.000689475729 bar per mg/L). Source: common practice (a brackish-water rule: at seawater TDS it reads
 * low). Negative TDS is an error.
 */
export function osmoticPressureBar(tdsMgL: number, osmoticBarPerMgL = defaultPerformanceSettings.osmoticBarPerMgL): number {
  nonNegative(tdsMgL, 'TDS');
  positive(osmoticBarPerMgL, 'osmoticBarPerMgL');
  return tdsMgL * osmoticBarPerMgL;
}

/**
 * Van 't Hoff osmotic pressure π = φ · i · c · R · T, bar, with c in mol/L (×1000 → mol/m³), T = tempC +
 * 273.15 K, i ions per formula unit, φ the osmotic coefficient (1 for the ideal relation).
 * Source: textbook relation (van 't Hoff); a cross-check of the TDS rule, not used in normalization.
 */
export function vantHoffOsmoticPressureBar(input: {
  molarityMolPerL: number;
  ionsPerFormula: number;
  tempC: number;
  osmoticCoefficient?: number;
}): number {
  nonNegative(input.molarityMolPerL, 'molarity');
  positive(input.ionsPerFormula, 'ions per formula unit');
  const kelvin = finite(input.tempC, 'temperature') + 273.15;
  if (kelvin <= 0) throw new RangeError(`temperature must be above absolute zero, got ${input.tempC} °C`);
  const phi = positive(input.osmoticCoefficient ?? 1, 'osmotic coefficient');
  const pascal = phi * input.ionsPerFormula * input.molarityMolPerL * 1000 * GAS_CONSTANT_J_PER_MOL_K * kelvin;
  return pascal / 1e5;
}

/**
 * Net driving pressure, bar: NDP = Pf − ΔPfb/2 − Pp − (πfb − πp), with ΔPfb = Pf − Pc the feed-to-concentrate
 * drop, πfb the osmotic pressure at the feed-brine average and πp at the permeate. Source: ASTM D4516
 * structure (sources above). May be ≤ 0 for nonsense data; callers treat that as
 * "no normalized flow" rather than dividing by it.
 */
export function netDrivingPressureBar(p: { pf: number; pc: number; pp: number; piFeedBrine: number; piPermeate: number }): number {
  const dp = finite(p.pf, 'feed pressure') - finite(p.pc, 'concentrate pressure');
  return p.pf - dp / 2 - finite(p.pp, 'permeate pressure') - (finite(p.piFeedBrine, 'πfb') - finite(p.piPermeate, 'πp'));
}

function checkTemperature(tempC: number): void {
  finite(tempC, 'temperature');
  if (tempC < 0 || tempC > 100) throw new RangeError(`temperature must be between 0 and 100 °C for liquid water, got ${tempC}`);
}

/**
 * Temperature correction factor TCF(T) = exp(U · (1/(273 + T) − 1/298)), T in °C, U in K: 3020 below 25 °C,
 * 2640 at or above (settings). It turns a flow measured at T into a 25 °C flow, so TCF > 1 in cold water and
 * TCF(25) = 1. Source: exponential TCF, common practice for polyamide membranes (sources above). Temperatures outside 0–100 °C are an error.
 */
export function temperatureCorrectionFactor(
  tempC: number,
  settings: Pick<PerformanceSettings, 'uBelow25K' | 'uAtOrAbove25K'> = defaultPerformanceSettings,
): number {
  checkTemperature(tempC);
  const u = tempC < 25 ? settings.uBelow25K : settings.uAtOrAbove25K;
  return Math.exp(u * (1 / (273 + tempC) - 1 / 298));
}

/** Viscosity term of the ΔP variant: 1 + k·(T − 25), k = 0.017 per °C. Source: a variant in use (sources above). */
export function viscosityTerm(tempC: number, perC = defaultPerformanceSettings.dpViscosityPerC): number {
  checkTemperature(tempC);
  const term = 1 + perC * (tempC - 25);
  if (term <= 0) throw new RangeError(`viscosity term 1 + ${perC}·(T − 25) is not positive at ${tempC} °C`);
  return term;
}

/** Every intermediate of one point, in the units named (shared/schemas/performance.ts). */
export type StageState = z.infer<typeof stageStateSchema>;

function checkPoint(point: PerformancePoint, what: string): void {
  if (!(point.time instanceof Date) || !Number.isFinite(point.time.getTime())) throw new RangeError(`${what}.time is not a valid date`);
  finite(point.pf, `${what}.pf`);
  finite(point.pc, `${what}.pc`);
  finite(point.pp, `${what}.pp`);
  if (point.pc > point.pf) throw new RangeError(`${what}: concentrate pressure (${point.pc}) exceeds feed pressure (${point.pf}) bar`);
  positive(point.cf, `${what}.cf`);
  nonNegative(point.cp, `${what}.cp`);
  if (point.qc !== undefined && point.qc !== null) nonNegative(point.qc, `${what}.qc`);
  checkTemperature(point.tempC);
}

/**
 * All intermediates of one operating point: recovery, Qc, TDS of feed, permeate and concentrate, feed-brine
 * average, osmotic pressures, ΔP, NDP, TCF, salt passage and average feed-brine flow. Source: ASTM D4516
 * structure (sources above). Bad input (non-finite values, Qp ≥ Qf, Pc > Pf, Cf ≤ 0,
 * temperature outside 0–100 °C) is an error naming the field.
 */
export function stageState(point: PerformancePoint, settings: Partial<PerformanceSettings> = {}, what = 'point'): StageState {
  const s = resolvePerformanceSettings(settings);
  checkPoint(point, what);
  const y = recovery(point.qp, point.qf);
  const qc = point.qf - point.qp;
  const cf = tdsFromConductivity(point.cf, s.tdsFactor);
  const cp = tdsFromConductivity(point.cp, s.tdsFactor);
  const cfb = feedBrineConcentration(cf, cp, y, s.feedBrineAverage);
  const piFb = osmoticPressureBar(cfb, s.osmoticBarPerMgL);
  const piP = osmoticPressureBar(cp, s.osmoticBarPerMgL);
  const measured = point.qc ?? null;
  return {
    time: point.time.toISOString(),
    recovery: y,
    concentrateFlowM3h: qc,
    measuredConcentrateFlowM3h: measured,
    concentrateFlowGapPct: measured === null ? null : (100 * (measured - qc)) / point.qf,
    feedTdsMgL: cf,
    permeateTdsMgL: cp,
    concentrateTdsMgL: concentrateConcentration(cf, cp, y),
    feedBrineTdsMgL: cfb,
    feedBrineAverage: s.feedBrineAverage,
    osmoticFeedBrineBar: piFb,
    osmoticPermeateBar: piP,
    differentialPressureBar: point.pf - point.pc,
    netDrivingPressureBar: netDrivingPressureBar({ pf: point.pf, pc: point.pc, pp: point.pp, piFeedBrine: piFb, piPermeate: piP }),
    tcf: temperatureCorrectionFactor(point.tempC, s),
    tempC: point.tempC,
    permeateFlowM3h: point.qp,
    saltPassagePct: (100 * cp) / cf,
    averageFeedBrineFlowM3h: (point.qf + qc) / 2,
  };
}

/** Normalized values of one point against a reference point, with % change from the reference (shared/schemas/performance.ts). */
export type NormalizedValues = z.infer<typeof normalizedValuesSchema>;

/**
 * Normalizes one stage state against a reference state (ASTM D4516 structure; sources above):
 * - permeate flow Qp,norm = Qp,act · (NDPref/NDPact) · (TCF(Tact)/TCF(Tref)), m³/h;
 * - salt passage SPnorm = SPact · (Qp,act/Qp,ref) · (Cfb,ref/Cfb,act) · (Cf,act/Cf,ref), %; no separate
 *   temperature term for salt (salt-passage form from memory);
 * - differential pressure ΔPnorm = ΔPact · (Qavg,ref/Qavg,act)^1.5, bar. In the viscosity variant both the
 *   point and the baseline are multiplied by 1 + 0.017·(T − 25) at their own temperature, so both are
 *   25 °C-equivalent and the % change compares like with like (with Tref = 25 °C the baseline is unchanged);
 * - % change = 100 · (normalized / baseline − 1).
 * Degenerate input: NDP ≤ 0 at the point or the reference → normalized flow and its change null with the
 * reason; the reference point normalized against itself gives its own values and 0 % changes.
 */
export function normalizeState(actual: StageState, reference: StageState, settings: Partial<PerformanceSettings> = {}): NormalizedValues {
  const s = resolvePerformanceSettings(settings);
  let permeateFlowM3h: number | null = null;
  let nullReason: string | null = null;
  if (reference.netDrivingPressureBar <= 0) {
    nullReason = `baseline net driving pressure is ${reference.netDrivingPressureBar.toFixed(3)} bar (≤ 0): normalized flow is undefined`;
  } else if (actual.netDrivingPressureBar <= 0) {
    nullReason = `net driving pressure is ${actual.netDrivingPressureBar.toFixed(3)} bar (≤ 0): normalized flow is undefined`;
  } else {
    permeateFlowM3h =
      actual.permeateFlowM3h * (reference.netDrivingPressureBar / actual.netDrivingPressureBar) * (actual.tcf / reference.tcf);
  }
  const saltPassagePct =
    actual.saltPassagePct *
    (actual.permeateFlowM3h / reference.permeateFlowM3h) *
    (reference.feedBrineTdsMgL / actual.feedBrineTdsMgL) *
    (actual.feedTdsMgL / reference.feedTdsMgL);
  const flowRatio = Math.pow(reference.averageFeedBrineFlowM3h / actual.averageFeedBrineFlowM3h, s.dpFlowExponent);
  let differentialPressureBar = actual.differentialPressureBar * flowRatio;
  let baselineDifferentialPressureBar = reference.differentialPressureBar;
  if (s.dpViscosityCorrection) {
    differentialPressureBar *= viscosityTerm(actual.tempC, s.dpViscosityPerC);
    baselineDifferentialPressureBar *= viscosityTerm(reference.tempC, s.dpViscosityPerC);
  }
  return {
    permeateFlowM3h,
    saltPassagePct,
    differentialPressureBar,
    baselinePermeateFlowM3h: reference.permeateFlowM3h,
    baselineSaltPassagePct: reference.saltPassagePct,
    baselineDifferentialPressureBar,
    permeateFlowChangePct: permeateFlowM3h === null ? null : changePct(permeateFlowM3h, reference.permeateFlowM3h),
    saltPassageChangePct: changePct(saltPassagePct, reference.saltPassagePct),
    differentialPressureChangePct: changePct(differentialPressureBar, baselineDifferentialPressureBar),
    nullReason,
  };
}

function changePct(value: number, baseline: number): number {
  return 100 * (value / baseline - 1);
}

/** What can set a new baseline (docs/design.md §6: "the first running day after the last cleaning or change-out"). */
export interface BaselineReset {
  at: Date;
  kind: 'cleaning' | 'element-change-out';
  /** The cleaning work order; null for a change-out. */
  workOrder: string | null;
  /** Elements installed in the change-out; null for a cleaning. */
  elements: number | null;
}

/**
 * Element change-outs large enough to reset a stage's performance baseline: at least `sharePct` % of the
 * stage's `positions` element positions replaced within `days` days. A single swap leaves the baseline
 * alone — a process engineer compares the stage with the state its membranes have been in since the
 * last cleaning or re-loading, and one new element of forty barely moves the stage's figures (common
 * practice; defaults 20 % within 7 days, both settings). Each change-out is dated by its last install
 * (the stage is back in its new state then). Installs are the times of installs after the initial fill.
 * Degenerate input: no installs or no positions → [].
 */
export function elementChangeOuts(installs: readonly Date[], positions: number, rule: { sharePct: number; days: number }): { at: Date; from: Date; elements: number }[] {
  if (positions <= 0 || installs.length === 0) return [];
  const times = installs.map((d) => d.getTime()).sort((a, b) => a - b);
  const needed = Math.max(1, Math.ceil((rule.sharePct / 100) * positions - 1e-9));
  const spanMs = rule.days * 86_400_000;
  const out: { at: Date; from: Date; elements: number }[] = [];
  for (let i = 0; i < times.length; ) {
    let j = i;
    while (j + 1 < times.length && times[j + 1]! - times[i]! <= spanMs) j++;
    if (j - i + 1 >= needed) {
      out.push({ at: new Date(times[j]!), from: new Date(times[i]!), elements: j - i + 1 });
      i = j + 1;
    } else i++;
  }
  return out;
}

type Baseline = z.infer<typeof performanceBaselineSchema>;
export type BaselineReason = Baseline['reason'];
export type BaselineSetBy = Baseline['setBy'];

/** Which event set a baseline that follows a reset at `resetAt`: the cleaning or change-out dated then (a cleaning first). */
export function baselineSetBy(resetAt: string | null, resets: readonly BaselineReset[]): BaselineSetBy {
  const at = resetAt === null ? [] : resets.filter((r) => r.at.toISOString() === resetAt);
  const event = at.find((r) => r.kind === 'cleaning') ?? at[0];
  if (!event) return { kind: 'first-running-day', at: null, workOrder: null, elements: null };
  return { kind: event.kind, at: event.at.toISOString(), workOrder: event.workOrder, elements: event.elements };
}

/** The baseline point of a series and why it is the one (the schema's baseline, without its state and event). */
export type BaselineChoice = Pick<Baseline, 'index' | 'time' | 'reason' | 'resetAt'>;

/**
 * Picks the baseline point of a time-sorted series: the first point at or after the latest reset time
 * (element change or cleaning) that still has a point at or after it; with no such reset, the first point
 * (the first day of running data). A point stamped before a reset is never its baseline, so a day that
 * began before a cleaning does not count as "after" it. Source: docs/design.md §6 (performance baseline).
 * Degenerate input: no points → null.
 */
export function selectBaseline(points: readonly { time: Date }[], resetTimes: readonly Date[] = []): BaselineChoice | null {
  if (points.length === 0) return null;
  const times = points.map((p, i) => {
    const ms = p.time.getTime();
    if (!Number.isFinite(ms)) throw new RangeError(`points[${i}].time is not a valid date`);
    if (i > 0 && ms < points[i - 1]!.time.getTime()) throw new RangeError('points must be sorted by time');
    return ms;
  });
  const lastMs = times[times.length - 1]!;
  const resets = resetTimes
    .map((r, i) => {
      const ms = r instanceof Date ? r.getTime() : Number.NaN;
      if (!Number.isFinite(ms)) throw new RangeError(`resetTimes[${i}] is not a valid date`);
      return ms;
    })
    .filter((ms) => ms <= lastMs)
    .sort((a, b) => a - b);
  const reset = resets[resets.length - 1];
  if (reset === undefined || reset <= times[0]!) {
    // A reset at or before the first point: the first point is already after it.
    const after = reset !== undefined;
    return { index: 0, time: new Date(times[0]!).toISOString(), reason: after ? 'after-reset' : 'first-running-day', resetAt: after ? new Date(reset).toISOString() : null };
  }
  const index = times.findIndex((ms) => ms >= reset);
  return { index, time: new Date(times[index]!).toISOString(), reason: 'after-reset', resetAt: new Date(reset).toISOString() };
}

export type PerformanceAlert = z.infer<typeof performanceAlertSchema>;
export type PerformanceAlertKind = PerformanceAlert['kind'];
export type NormalizedPoint = z.infer<typeof normalizedPointSchema>;

/** One stage's normalized series: the parts of the stage's answer (shared/schemas/performance.ts) the maths gives. */
export type PerformanceResult = Pick<z.infer<typeof performanceStageSchema>, 'baseline' | 'latest' | 'alerts' | 'settings' | 'notes'> & {
  points: NormalizedPoint[];
};

interface AlertRule {
  kind: PerformanceAlertKind;
  threshold: (s: PerformanceSettings) => number;
  /** Whether a point's change crosses the threshold (never when the change is not computable). */
  crossing: (n: NormalizedValues, threshold: number) => boolean;
  value: (n: NormalizedValues) => number | null;
  baseline: (n: NormalizedValues) => number;
  change: (n: NormalizedValues) => number | null;
  unit: PerformanceAlert['unit'];
  message: (change: number) => string;
  recommendation: string;
}

const fmt = (x: number) => (Math.round(x * 10) / 10).toFixed(1);

const alertRules: AlertRule[] = [
  {
    kind: 'permeate-flow-drop',
    threshold: (s) => s.flowDropPct,
    crossing: (n, t) => n.permeateFlowChangePct !== null && n.permeateFlowChangePct <= -t,
    value: (n) => n.permeateFlowM3h,
    baseline: (n) => n.baselinePermeateFlowM3h,
    change: (n) => n.permeateFlowChangePct,
    unit: 'm3/h',
    message: (c) => `Normalized permeate flow is ${fmt(-c)} % below the baseline.`,
    recommendation:
      'Fouling or scaling is likely: plan a clean-in-place with the chemicals the element maker specifies for the ' +
      'suspected foulant, and check pretreatment (cartridge filter pressure drop, antiscalant dosing, SDI).',
  },
  {
    kind: 'differential-pressure-rise',
    threshold: (s) => s.dpRisePct,
    crossing: (n, t) => n.differentialPressureChangePct >= t,
    value: (n) => n.differentialPressureBar,
    baseline: (n) => n.baselineDifferentialPressureBar,
    change: (n) => n.differentialPressureChangePct,
    unit: 'bar',
    message: (c) => `Normalized differential pressure is ${fmt(c)} % above the baseline.`,
    recommendation:
      'Feed channels are likely blocked by particulate or biological fouling: plan a clean-in-place, and inspect the ' +
      'feed-end elements and the cartridge filters.',
  },
  {
    kind: 'salt-passage-rise',
    threshold: (s) => s.saltPassageRisePct,
    crossing: (n, t) => n.saltPassageChangePct >= t,
    value: (n) => n.saltPassagePct,
    baseline: (n) => n.baselineSaltPassagePct,
    change: (n) => n.saltPassageChangePct,
    unit: '%',
    message: (c) => `Normalized salt passage is ${fmt(c)} % above the baseline.`,
    recommendation:
      'Check for leaking O-rings or interconnectors, damaged elements or scaling: compare permeate conductivity vessel ' +
      'by vessel (and probe the suspect vessel) before deciding between a clean and element replacement.',
  },
];

/**
 * Threshold alerts on the latest point of a normalized series (points at or after the baseline only):
 * normalized permeate flow change ≤ −flowDropPct, normalized ΔP change ≥ +dpRisePct, normalized salt passage
 * change ≥ +saltPassageRisePct (defaults 10, 15, 5 %; common practice cleaning triggers). `since` is the
 * first point of the unbroken run of crossing points ending at the latest. Every alert carries the
 * maintenance cautions (shared/cautions.ts). Degenerate input: no points after the baseline → [].
 */
export function performanceAlerts(series: readonly NormalizedPoint[], settings: Partial<PerformanceSettings> = {}): PerformanceAlert[] {
  const s = resolvePerformanceSettings(settings);
  const latest = series[series.length - 1];
  if (!latest) return [];
  const alerts: PerformanceAlert[] = [];
  for (const rule of alertRules) {
    const threshold = rule.threshold(s);
    if (!rule.crossing(latest.normalized, threshold)) continue;
    let first = series.length - 1;
    while (first > 0 && rule.crossing(series[first - 1]!.normalized, threshold)) first -= 1;
    const change = rule.change(latest.normalized)!;
    alerts.push({
      kind: rule.kind,
      time: latest.state.time,
      since: series[first]!.state.time,
      changePct: change,
      thresholdPct: threshold,
      value: rule.value(latest.normalized)!,
      baselineValue: rule.baseline(latest.normalized),
      unit: rule.unit,
      message: rule.message(change),
      recommendation: rule.recommendation,
      cautions: [...maintenanceCautions],
    });
  }
  return alerts;
}

/**
 * Normalized performance of one stage over a series of points: picks the baseline (first running day, or
 * first day after the latest element change or cleaning), computes every point's intermediates and its
 * normalized permeate flow, salt passage and ΔP with % change from the baseline, and raises threshold
 * alerts on the latest point. Source: ASTM D4516 structure (sources above); alert
 * thresholds common practice. Points are sorted by time first. Degenerate input: no points → baseline
 * null, no points, no alerts, and a note; points before the baseline are normalized too (so a trend chart
 * shows the step at a cleaning) but never raise alerts.
 */
export function normalizePerformance(
  points: readonly PerformancePoint[],
  options: { resets?: readonly BaselineReset[]; settings?: Partial<PerformanceSettings> } = {},
): PerformanceResult {
  const settings = resolvePerformanceSettings(options.settings);
  const notes: string[] = [];
  const states = points.map((p, i) => stageState(p, settings, `points[${i}]`));
  const order = states.map((_, i) => i).sort((a, b) => points[a]!.time.getTime() - points[b]!.time.getTime() || a - b);
  const sortedPoints = order.map((i) => points[i]!);
  const sortedStates = order.map((i) => states[i]!);
  const resets = options.resets ?? [];
  const choice = selectBaseline(sortedPoints, resets.map((r) => r.at));
  if (choice === null) {
    notes.push('No running data in the window: nothing to normalize.');
    return { baseline: null, points: [], latest: null, alerts: [], settings, notes };
  }
  const reference = sortedStates[choice.index]!;
  if (reference.netDrivingPressureBar <= 0) {
    notes.push('The baseline net driving pressure is not positive: normalized flows are null; check the baseline data.');
  }
  const normalized = sortedStates.map((state) => ({ state, normalized: normalizeState(state, reference, settings) }));
  if (choice.index > 0) {
    // Date-free: the page shows the baseline day in the reader's time zone beside this note.
    notes.push(
      `${countOf(choice.index, 'day', 'days')} before the baseline ${agree(choice.index, 'is shown against it but raises no alert', 'are shown against it but raise no alerts')}.`,
    );
  }
  return {
    baseline: { ...choice, state: reference, setBy: baselineSetBy(choice.resetAt, resets) },
    points: normalized,
    latest: normalized[normalized.length - 1] ?? null,
    alerts: performanceAlerts(normalized.slice(choice.index), settings),
    settings,
    notes,
  };
}
