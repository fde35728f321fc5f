// Membrane element life: Kaplan–Meier survival with Greenwood bounds, a two-parameter Weibull fitted
// by maximum likelihood with right censoring (with likelihood-ratio or Wald confidence intervals),
// median-rank regression as a cross-check, and the life figures derived from a fit.
// Time is in whatever unit the caller passes (Osmia passes days); every function is unit-agnostic.
//
// Delayed entry (left truncation): a life first seen at age e > 0 (an element already in service
// when the observation window opened) is given as `entries[i] = e`. It is at risk only at ages
// e < t ≤ its time, and the Weibull likelihood conditions on survival to e. Klein & Moeschberger,
// Survival Analysis, 2nd ed., ch. 4 (truncation). Without `entries` every life enters at age 0 and
// the answers are the plain right-censored ones.
import {
  assertFinite,
  assertProbability,
  chiSquareQuantile,
  gammaFunction,
  normalQuantile,
  monotoneRoot,
  type NullReason,
} from './stats.ts';

function checkLives(times: readonly number[], events: readonly boolean[], entries?: readonly number[]): void {
  if (times.length !== events.length) {
    throw new RangeError(`times and events differ in length (${times.length} vs ${events.length}).`);
  }
  if (entries !== undefined && entries.length !== times.length) {
    throw new RangeError(`times and entries differ in length (${times.length} vs ${entries.length}).`);
  }
  times.forEach((t, i) => {
    assertFinite(t, `times[${i}]`);
    if (t < 0) throw new RangeError(`times[${i}] must be ≥ 0, got ${t}.`);
  });
  events.forEach((e, i) => {
    if (typeof e !== 'boolean')
      throw new RangeError(`events[${i}] must be true (life-ending event) or false (censored).`);
  });
  entries?.forEach((e, i) => {
    assertFinite(e, `entries[${i}]`);
    // A life that enters at age e > 0 must be seen for some time after it: e < t.
    if (e < 0 || (e > 0 && !(e < times[i]!))) {
      throw new RangeError(`entries[${i}] must be 0, or > 0 and below times[${i}] (${times[i]}), got ${e}.`);
    }
  });
}

// ---------------------------------------------------------------------------------------------
// Kaplan–Meier

export interface KaplanMeierRow {
  /** A distinct observed time (event or censoring). */
  t: number;
  /**
   * Units with time ≥ t (a unit censored at t is still at risk at t) that have entered by then:
   * entry age 0, or entry age < t.
   */
  nRisk: number;
  nEvents: number;
  nCensored: number;
  /** S(t), the estimate just after t. */
  survival: number;
  /** Greenwood standard error of S(t); null once S = 0. */
  se: number | null;
  /** Log-transformed bounds S·exp(∓z·√Σ d/(n(n−d))), upper capped at 1; null once S = 0. */
  lower: number | null;
  upper: number | null;
}

export interface KaplanMeierResult {
  confidence: number;
  n: number;
  events: number;
  rows: KaplanMeierRow[];
  /** KM median; null with 'not-reached' when S never falls to 0.5, 'no-data' for no units. */
  median: number | null;
  medianLower: number | null;
  medianUpper: number | null;
  reason?: NullReason;
}

/**
 * Kaplan–Meier product-limit estimate S(t) = Π_{t_j ≤ t} (1 − d_j/n_j) over distinct event times,
 * n_j = units with time ≥ t_j (a censoring tied with an event is still at risk), with Greenwood's
 * standard error S·√Σ d_j/(n_j(n_j − d_j)) and the log-transformed confidence interval
 * S·exp(±z·√Σ d_j/(n_j(n_j − d_j))), z the (1 + C)/2 normal quantile, the upper limit capped at 1 —
 * the conventions of R survival::survfit (defaults). Kaplan & Meier (1958), Greenwood (1926).
 *
 * One row per distinct time (events and censorings, as survfit lists them). The median is the first
 * time S ≤ 0.5; where S equals 0.5 exactly over a stretch, the midpoint of that stretch (to the next
 * drop, or to the last observed time), as survfit prints it. The median's limits are the same rule
 * applied to the lower and upper curves.
 *
 * With `entries` (delayed entry, left truncation): n_j counts only the units with entry age
 * e_i < t_j ≤ t_i, so a unit first seen at age e adds to the risk sets after e and not before; a
 * unit with entry 0 is at risk from age 0 itself, as without entries. The product-limit and
 * Greenwood forms are unchanged with these risk sets (Klein & Moeschberger, Survival Analysis, 2nd
 * ed., ch. 4, estimation for left-truncated and right-censored data). S(t) is then conditional on
 * survival to the smallest entry age; when early risk sets are small the curve can fall to 0 and
 * stay there although later units entered — a property of the estimator, not an error.
 *
 * Degenerate input: no units → no rows, median null ('no-data'); all censored → S = 1 throughout,
 * median null ('not-reached'). Throws on negative or non-finite times, length mismatch, an entry age
 * that is not 0 or below its time, or confidence outside (0, 1).
 */
export function kaplanMeier(
  times: readonly number[],
  events: readonly boolean[],
  confidence: number,
  entries?: readonly number[],
): KaplanMeierResult {
  checkLives(times, events, entries);
  assertProbability(confidence, 'confidence', { open: true });
  const z = normalQuantile((1 + confidence) / 2);
  const order = times.map((t, i) => ({ t, e: events[i]! })).sort((a, b) => a.t - b.t);
  // Positive entry ages in order: those ≥ t have not entered yet at t.
  const lateEntries = (entries ?? []).filter((e) => e > 0).sort((a, b) => a - b);
  let entered = 0;
  const rows: KaplanMeierRow[] = [];
  let atRisk = order.length;
  let survival = 1;
  let greenwood = 0;
  let zeroReached = false;
  for (let i = 0; i < order.length;) {
    const t = order[i]!.t;
    let d = 0;
    let c = 0;
    while (i < order.length && order[i]!.t === t) {
      if (order[i]!.e) d += 1;
      else c += 1;
      i += 1;
    }
    while (entered < lateEntries.length && lateEntries[entered]! < t) entered += 1;
    // Every unit with time ≥ t, less those entering at or after t (their time is above t, so they
    // are among the former). At least the units ending at t are left: entry < time.
    const nRisk = atRisk - (lateEntries.length - entered);
    if (d > 0) {
      survival *= 1 - d / nRisk;
      if (d < nRisk) greenwood += d / (nRisk * (nRisk - d));
      else zeroReached = true;
    }
    const root = Math.sqrt(greenwood);
    rows.push({
      t,
      nRisk,
      nEvents: d,
      nCensored: c,
      survival,
      se: zeroReached ? null : survival * root,
      lower: zeroReached ? null : survival * Math.exp(-z * root),
      upper: zeroReached ? null : Math.min(1, survival * Math.exp(z * root)),
    });
    atRisk -= d + c;
  }
  const eventCount = events.filter(Boolean).length;
  const base = { confidence, n: times.length, events: eventCount, rows };
  if (rows.length === 0) return { ...base, median: null, medianLower: null, medianUpper: null, reason: 'no-data' };
  // Past S = 0 the log-scale limits are undefined; the curve itself is 0 there, so are its limits.
  const median = curveMedian(rows, (row) => row.survival);
  return {
    ...base,
    median,
    medianLower: curveMedian(rows, (row) => row.lower ?? 0),
    medianUpper: curveMedian(rows, (row) => row.upper ?? 0),
    ...(median === null ? { reason: 'not-reached' as const } : {}),
  };
}

/** First time a step curve is ≤ 0.5, with survfit's midpoint rule for a stretch exactly at 0.5. */
function curveMedian(rows: readonly KaplanMeierRow[], value: (row: KaplanMeierRow) => number): number | null {
  const tolerance = Math.sqrt(Number.EPSILON);
  for (let j = 0; j < rows.length; j++) {
    const y = value(rows[j]!);
    if (Math.abs(y - 0.5) < tolerance) {
      for (let k = j + 1; k < rows.length; k++) {
        if (value(rows[k]!) < 0.5 - tolerance) return (rows[j]!.t + rows[k]!.t) / 2;
      }
      return (rows[j]!.t + rows[rows.length - 1]!.t) / 2;
    }
    if (y < 0.5) return rows[j]!.t;
  }
  return null;
}

/**
 * Restricted mean survival time ∫₀^τ S(t) dt of a Kaplan–Meier curve (area under the step
 * function up to τ), in the unit of the times. Royston & Parmar (2013). τ must be ≥ 0; past the
 * last row S keeps its last value.
 */
export function kmRestrictedMean(km: Pick<KaplanMeierResult, 'rows'>, tau: number): number {
  assertFinite(tau, 'tau');
  if (tau < 0) throw new RangeError(`tau must be ≥ 0, got ${tau}.`);
  let area = 0;
  let previousT = 0;
  let s = 1;
  for (const row of km.rows) {
    if (row.t >= tau) break;
    area += s * (row.t - previousT);
    previousT = row.t;
    s = row.survival;
  }
  return area + s * (tau - previousT);
}

// ---------------------------------------------------------------------------------------------
// Weibull

export interface WeibullParams {
  /** β > 0, dimensionless. */
  shape: number;
  /** η > 0, in the unit of the times (days for elements). */
  scale: number;
}

export type WeibullInterval = 'likelihood-ratio' | 'wald-log';

export interface WeibullFit extends WeibullParams {
  /** Units used (times > 0) and life-ending events among them. */
  n: number;
  events: number;
  /** Units left out because their time is 0 (a zero life has no Weibull density). */
  excludedZeroTimes: number;
  logLik: number;
  confidence: number;
  intervalMethod: WeibullInterval;
  /**
   * Interval limits. A likelihood-ratio lower limit that does not close within a factor 10⁶ of the
   * estimate is reported as 0 (a true, if weak, bound); such an upper limit is null and
   * `upperReason` says 'unbounded' (heavily censored data can leave the likelihood almost flat).
   */
  shapeLower: number;
  shapeUpper: number | null;
  scaleLower: number;
  scaleUpper: number | null;
  upperReason?: NullReason;
  /** Inverse observed information for (ln β, ln η): [[var ln β, cov], [cov, var ln η]]. */
  covarianceLog: [[number, number], [number, number]];
}

export type WeibullFitResult =
  { fit: WeibullFit; reason?: undefined } | { fit: null; reason: NullReason; n: number; events: number };

export interface WeibullFitOptions {
  /** Confidence level of the shape and scale intervals, default 0.9. */
  confidence?: number;
  /** Default 'likelihood-ratio'. */
  interval?: WeibullInterval;
  /** Entry age of each unit (delayed entry), 0 for a unit seen from age 0; default all 0. */
  entries?: readonly number[];
}

/**
 * The censored, left-truncated Weibull log-likelihood of one data set, over logarithms taken once:
 * with l = ln t − ln η, z = e^{βl}, and for a unit entering at age e > 0 also m = ln e − ln η,
 * w = e^{βm} = (e/η)^β (the −ln S(e) that conditioning on survival to e adds back),
 *   ℓ(β, η) = r ln β − rβ ln η + (β − 1) Σ_events ln t − Σ_all z + Σ_entered w,
 *   ∂ℓ/∂β = r/β + Σ_events l − (Σ z·l − Σ w·m),   ∂²ℓ/∂β² = −r/β² − (Σ z·l² − Σ w·m²),
 *   ∂ℓ/∂ln η = β((Σ z − Σ w) − r).
 * The w terms have the form of the z terms with the opposite sign, so every sum below is the net
 * one (units' z minus entries' w). Each evaluation is one pass over the units and one over the late
 * entries (none without delayed entry) with one exponential each.
 */
interface Likelihood {
  n: number;
  r: number;
  logLik(shape: number, scale: number): number;
  /** ℓ and its derivatives in (ln β, ln η), in one pass. */
  withGradient(shape: number, scale: number): { value: number; dLogShape: number; dLogScale: number };
  /** ∂ℓ/∂β and ∂²ℓ/∂β² at fixed η (ℓ is strictly concave in β). */
  shapeScore(shape: number, scale: number): readonly [number, number];
  /** Net Σ z − Σ w, Σ z·l − Σ w·m, Σ z·l² − Σ w·m² at (β, η). */
  sums(shape: number, scale: number): readonly [number, number, number];
  /** The MLE of η for a given β: ((Σ t^β − Σ e^β) / r)^{1/β}, on t / max t so t^β cannot overflow. */
  profileScale(shape: number): number;
}

interface LifeData {
  times: number[];
  events: boolean[];
  /** Positive entry ages (delayed entry), in no particular order; empty without delayed entry. */
  lateEntries: number[];
  excludedZeroTimes: number;
}

function positiveLives(times: readonly number[], events: readonly boolean[], entries?: readonly number[]): LifeData {
  checkLives(times, events, entries);
  const kept: LifeData = { times: [], events: [], lateEntries: [], excludedZeroTimes: 0 };
  times.forEach((t, i) => {
    // A zero time has entry 0 (checkLives): nothing to condition on.
    if (t === 0) kept.excludedZeroTimes += 1;
    else {
      kept.times.push(t);
      kept.events.push(events[i]!);
      const e = entries?.[i] ?? 0;
      if (e > 0) kept.lateEntries.push(e);
    }
  });
  return kept;
}

function makeLikelihood({ times, events, lateEntries }: LifeData): Likelihood {
  const n = times.length;
  const lnTMax = Math.log(maxOf(times));
  /** ln(t / max t) ≤ 0 */
  const u = Float64Array.from(times, (t) => Math.log(t) - lnTMax);
  /** ln(e / max t) < 0 for each late entry (e < its t ≤ max t). */
  const v = Float64Array.from(lateEntries, (e) => Math.log(e) - lnTMax);
  const k = v.length;
  let r = 0;
  let sumLnEvents = 0;
  for (let i = 0; i < n; i++) {
    if (!events[i]) continue;
    r += 1;
    sumLnEvents += u[i]! + lnTMax;
  }
  /** Σ z, Σ z·l, Σ z·l² at (β, η). */
  const sums = (shape: number, scale: number): readonly [number, number, number] => {
    const a = lnTMax - Math.log(scale);
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const l = u[i]! + a;
      const z = Math.exp(shape * l);
      // z·l with l = 0 is 0 even if z overflowed elsewhere.
      if (l !== 0) {
        const zl = z * l;
        s1 += zl;
        s2 += zl * l;
      }
      s0 += z;
    }
    for (let j = 0; j < k; j++) {
      const m = v[j]! + a;
      const w = Math.exp(shape * m);
      if (m !== 0) {
        const wm = w * m;
        s1 -= wm;
        s2 -= wm * m;
      }
      s0 -= w;
    }
    return [s0, s1, s2];
  };
  const value = (shape: number, scale: number, sumZ: number): number => {
    const lnScale = Math.log(scale);
    return r * Math.log(shape) - r * shape * lnScale + (shape - 1) * sumLnEvents - sumZ;
  };
  return {
    n,
    r,
    sums,
    logLik(shape, scale) {
      const a = lnTMax - Math.log(scale);
      let s0 = 0;
      for (let i = 0; i < n; i++) s0 += Math.exp(shape * (u[i]! + a));
      for (let j = 0; j < k; j++) s0 -= Math.exp(shape * (v[j]! + a));
      return value(shape, scale, s0);
    },
    withGradient(shape, scale) {
      const [s0, s1] = sums(shape, scale);
      const sumLEvents = sumLnEvents - r * Math.log(scale);
      return { value: value(shape, scale, s0), dLogShape: shape * (r / shape + sumLEvents - s1), dLogScale: shape * (s0 - r) };
    },
    shapeScore(shape, scale) {
      const [, s1, s2] = sums(shape, scale);
      return [r / shape + sumLnEvents - r * Math.log(scale) - s1, -r / (shape * shape) - s2];
    },
    profileScale(shape) {
      let s = 0;
      for (let i = 0; i < n; i++) s += Math.exp(shape * u[i]!);
      for (let j = 0; j < k; j++) s -= Math.exp(shape * v[j]!);
      return Math.exp(lnTMax + Math.log(s / r) / shape);
    },
  };
}

const MAX_SHAPE = 1e4;
/** How far from the estimate a likelihood-ratio limit is sought: a factor 10⁶. */
const LIMIT_RANGE = Math.log(1e6);

/**
 * Two-parameter Weibull fitted by maximum likelihood with right censoring. With r events among n
 * units, the shape β solves the profile score equation
 *   Σ_all t^β ln t / Σ_all t^β − 1/β − (1/r) Σ_events ln t = 0
 * (increasing in β, so its root is unique), and the scale is then closed-form,
 * η = (Σ_all t^β / r)^{1/β}. Lawless, Statistical Models and Methods for Lifetime Data, ch. 5;
 * NIST/SEMATECH e-Handbook §8.4.1.2. Roots are found by safeguarded Newton steps (`monotoneRoot`).
 *
 * With `options.entries` (delayed entry): the likelihood conditions each unit on survival to its
 * entry age e, log L = Σ_events ln f(t) + Σ_censored ln S(t) − Σ_all ln S(e), S(x) = exp(−(x/η)^β)
 * (Klein & Moeschberger, Survival Analysis, 2nd ed., ch. 4 on truncation); each late entry adds
 * +(e/η)^β. Every Σ_all t^β above becomes Σ_all t^β − Σ_entered e^β (and likewise with ln t), so
 * η = ((Σ t^β − Σ e^β)/r)^{1/β}. The profile score stays increasing in β: Σ(t^β − e^β) = β∫e^{βy}dμ
 * over the union of the intervals [ln e, ln t], so it is the derivative of a log moment-generating
 * function, whose root is unique. Every unit entered late (none seen from age 0) can leave the
 * likelihood rising as β → 0; that, like the case below, is 'shape-diverges'.
 *
 * Intervals at the given confidence C (default 0.9):
 * - 'likelihood-ratio' (default): {θ : 2(ℓ̂ − ℓ_profile(θ)) ≤ χ²_C(1)} for β and for η separately;
 *   better than Wald intervals at the small samples a plant has (Meeker & Escobar, Statistical
 *   Methods for Reliability Data, ch. 8 — from memory).
 * - 'wald-log': β·exp(±z·se(ln β)), η·exp(±z·se(ln η)) from the observed information matrix.
 * `covarianceLog` (observed information, inverted, for ln β and ln η) is returned either way.
 *
 * Degenerate input: no units with time > 0 → null ('no-data'); no events → null ('no-events');
 * every event at the longest time observed (e.g. one unit, or all failed at one age with nothing
 * running longer) → the likelihood grows without bound as β → ∞: null ('shape-diverges'). Zero
 * times are left out and counted (`excludedZeroTimes`). Throws on negative or non-finite times.
 */
export function fitWeibull(
  times: readonly number[],
  events: readonly boolean[],
  options: WeibullFitOptions = {},
): WeibullFitResult {
  const confidence = options.confidence ?? 0.9;
  const intervalMethod = options.interval ?? 'likelihood-ratio';
  assertProbability(confidence, 'confidence', { open: true });
  const data = positiveLives(times, events, options.entries);
  if (data.times.length === 0) return { fit: null, reason: 'no-data', n: 0, events: 0 };
  const likelihood = makeLikelihood(data);
  const { n, r } = likelihood;
  if (r === 0) return { fit: null, reason: 'no-events', n, events: r };
  const mle = weibullMle(data, likelihood);
  if (mle === null) return { fit: null, reason: 'shape-diverges', n, events: r };
  const { shape, scale } = mle;
  const logLik = likelihood.logLik(shape, scale);
  const covarianceLog = observedCovarianceLog(likelihood, shape, scale);

  let shapeLower: number;
  let shapeUpper: number | null;
  let scaleLower: number;
  let scaleUpper: number | null;
  if (intervalMethod === 'wald-log') {
    const z = normalQuantile((1 + confidence) / 2);
    const seShape = Math.sqrt(covarianceLog[0][0]);
    const seScale = Math.sqrt(covarianceLog[1][1]);
    shapeLower = shape * Math.exp(-z * seShape);
    shapeUpper = shape * Math.exp(z * seShape);
    scaleLower = scale * Math.exp(-z * seScale);
    scaleUpper = scale * Math.exp(z * seScale);
  } else {
    const q = chiSquareQuantile(confidence, 1);
    // Profile deviance in ln β: η at its MLE for that β. By the envelope theorem its derivative is
    // −2·∂ℓ/∂ln β there (∂ℓ/∂η = 0 on the profile).
    const shapeDeviance = (logB: number): readonly [number, number] => {
      const b = Math.exp(logB);
      const at = likelihood.withGradient(b, likelihood.profileScale(b));
      return [2 * (logLik - at.value) - q, -2 * at.dLogShape];
    };
    // Profile deviance in ln η: β at its MLE for that η (warm-started from the last one); derivative
    // −2·∂ℓ/∂ln η = −2β(Σz − r) there.
    let warmShape = shape;
    const scaleDeviance = (logEta: number): readonly [number, number] => {
      const eta = Math.exp(logEta);
      warmShape = profileShape(likelihood, eta, warmShape);
      const at = likelihood.withGradient(warmShape, eta);
      return [2 * (logLik - at.value) - q, -2 * at.dLogScale];
    };
    const zq = Math.sqrt(q);
    const seShape = Math.sqrt(covarianceLog[0][0]);
    const seScale = Math.sqrt(covarianceLog[1][1]);
    shapeLower = likelihoodLimit(shapeDeviance, shape, seShape * zq, -1) ?? 0;
    shapeUpper = likelihoodLimit(shapeDeviance, shape, seShape * zq, +1);
    warmShape = shape;
    scaleLower = likelihoodLimit(scaleDeviance, scale, seScale * zq, -1) ?? 0;
    warmShape = shape;
    scaleUpper = likelihoodLimit(scaleDeviance, scale, seScale * zq, +1);
  }
  return {
    fit: {
      shape,
      scale,
      n,
      events: r,
      excludedZeroTimes: data.excludedZeroTimes,
      logLik,
      confidence,
      intervalMethod,
      shapeLower,
      shapeUpper,
      scaleLower,
      scaleUpper,
      ...(shapeUpper === null || scaleUpper === null ? { upperReason: 'unbounded' as const } : {}),
      covarianceLog,
    },
  };
}

/** MLE (β̂, η̂) or null when every event sits at the longest time, or the root lies below β = 10⁻⁶. */
function weibullMle({ times, events }: LifeData, likelihood: Likelihood): WeibullParams | null {
  const tMax = maxOf(times);
  if (times.every((t, i) => !events[i] || t === tMax)) return null;
  let meanLnEvents = 0; // of ln(t / max t) ≤ 0
  times.forEach((t, i) => {
    if (events[i]) meanLnEvents += Math.log(t / tMax) / likelihood.r;
  });
  // Profile score in x = ln β, on u = t / max t (so u^β never overflows): with Σ u^β ln u etc. from
  // the likelihood's (net) sums at η = max t, s1/s0 − 1/β − mean ln u over events. Its β-derivative
  // is the weighted variance of ln u plus 1/β² (with late entries: the variance under the tilted
  // interval measure of fitWeibull's comment), so it increases.
  const score = (x: number): readonly [number, number] => {
    const b = Math.exp(x);
    const [s0, s1, s2] = likelihood.sums(b, tMax);
    const m = s1 / s0;
    return [m - 1 / b - meanLnEvents, b * (s2 / s0 - m * m + 1 / (b * b))];
  };
  const x = monotoneRoot(score, {
    x0: 0,
    lo: { at: Math.log(1e-6), known: false },
    hi: { at: Math.log(MAX_SHAPE), known: false },
    increasing: true,
    tolerance: 1e-15,
  });
  if (x === null) return null;
  const shape = Math.exp(x);
  return { shape, scale: likelihood.profileScale(shape) };
}

/**
 * The β maximizing ℓ(β, η) at fixed η (the root of ∂ℓ/∂β), from a warm start. Without late entries ℓ
 * is concave in β. A late entry's +(e/η)^β term can bend it the other way where e ≪ η, so the root
 * is then the one reached from the warm start (the previous point on the profile, starting at β̂);
 * the tests check the resulting limits against a plain numerical profile of the formula.
 */
function profileShape(likelihood: Likelihood, scale: number, start: number): number {
  // In x = ln β: d/dx ∂ℓ/∂β = β ∂²ℓ/∂β² < 0, so the score decreases.
  const score = (x: number): readonly [number, number] => {
    const b = Math.exp(x);
    const [g, h] = likelihood.shapeScore(b, scale);
    return [g, b * h];
  };
  const x0 = Math.log(start);
  const x = monotoneRoot(score, {
    x0,
    lo: { at: x0 - 200, known: false },
    hi: { at: x0 + 200, known: false },
    increasing: false,
    tolerance: 1e-14,
  });
  return Math.exp(x ?? x0);
}

/**
 * Where a profile deviance (−χ² at the estimate, rising away from it) crosses zero, on the log
 * scale in `direction` from the estimate, starting from the Wald guess `guess` (in log units) away;
 * null when it has not crossed within a factor 10⁶.
 */
function likelihoodLimit(
  deviance: (logX: number) => readonly [number, number],
  estimate: number,
  guess: number,
  direction: 1 | -1,
): number | null {
  const start = Math.log(estimate);
  const far = start + direction * LIMIT_RANGE;
  const near = { at: start, known: true };
  const farEnd = { at: far, known: false };
  const logX = monotoneRoot(deviance, {
    x0: start + direction * Math.min(Number.isFinite(guess) && guess > 0 ? guess : 0.05, LIMIT_RANGE),
    lo: direction > 0 ? near : farEnd,
    hi: direction > 0 ? farEnd : near,
    increasing: direction > 0,
    tolerance: 1e-13,
  });
  return logX === null ? null : Math.exp(logX);
}

/** Inverse of the observed information for (ln β, ln η) at the MLE. */
function observedCovarianceLog(likelihood: Likelihood, shape: number, scale: number): [[number, number], [number, number]] {
  const r = likelihood.r;
  const [sumZ, sumZL, sumZL2] = likelihood.sums(shape, scale);
  // Observed information (minus the Hessian of ℓ) in (β, η).
  const iBB = r / shape ** 2 + sumZL2;
  const iEE = -((r * shape) / scale ** 2 - ((shape * (shape + 1)) / scale ** 2) * sumZ);
  const iBE = -(-r / scale + sumZ / scale + (shape / scale) * sumZL);
  // At the MLE the score is zero, so the log-scale information is J·I·J with J = diag(β, η).
  const a = iBB * shape * shape;
  const d = iEE * scale * scale;
  const b = iBE * shape * scale;
  const det = a * d - b * b;
  return [
    [d / det, -b / det],
    [-b / det, a / det],
  ];
}

/**
 * Points on the boundary of the joint likelihood-ratio confidence region of (β, η):
 * {(β, η) : 2(ℓ̂ − ℓ(β, η)) = χ²_C(dof)}, found along `points` rays from the MLE in (ln β, ln η)
 * space (rays spread by the Cholesky factor of `covarianceLog`, so they are even around the region;
 * along each the root is sought by Newton steps from √χ², where a quadratic likelihood would cross).
 * dof = 1 gives the region whose extremes are the profile-likelihood interval of any single
 * quantity computed from (β, η) (used for the forecast band); dof = 2 the joint region.
 * A ray that has not closed at 10³ standard deviations stops there (`closed: false`).
 * `entries` (delayed entry) as for fitWeibull.
 * Returns [] when no fit is possible (same degenerate cases as fitWeibull).
 */
export function weibullConfidenceRegion(
  times: readonly number[],
  events: readonly boolean[],
  options: { confidence?: number; dof?: 1 | 2; points?: number; entries?: readonly number[] } = {},
): Array<WeibullParams & { closed: boolean }> {
  const confidence = options.confidence ?? 0.9;
  const dof = options.dof ?? 1;
  const points = options.points ?? 72;
  if (!Number.isInteger(points) || points < 4) throw new RangeError('points must be a whole number ≥ 4.');
  const entries = options.entries;
  const result = fitWeibull(times, events, { confidence, interval: 'wald-log', ...(entries ? { entries } : {}) });
  if (result.fit === null) return [];
  const { shape, scale, logLik, covarianceLog } = result.fit;
  const likelihood = makeLikelihood(positiveLives(times, events, entries));
  const q = chiSquareQuantile(confidence, dof);
  const l11 = Math.sqrt(covarianceLog[0][0]);
  const l21 = covarianceLog[1][0] / l11;
  const l22 = Math.sqrt(Math.max(covarianceLog[1][1] - l21 * l21, 0));
  const region: Array<WeibullParams & { closed: boolean }> = [];
  const farthest = 1e3;
  for (let k = 0; k < points; k++) {
    const phi = (2 * Math.PI * k) / points;
    const du = l11 * Math.cos(phi);
    const dv = l21 * Math.cos(phi) + l22 * Math.sin(phi);
    const at = (rho: number): WeibullParams => ({ shape: shape * Math.exp(rho * du), scale: scale * Math.exp(rho * dv) });
    const deviance = (rho: number): readonly [number, number] => {
      const p = at(rho);
      const g = likelihood.withGradient(p.shape, p.scale);
      const value = 2 * (logLik - g.value) - q;
      return [Number.isNaN(value) ? Infinity : value, -2 * (g.dLogShape * du + g.dLogScale * dv)];
    };
    const rho = monotoneRoot(deviance, {
      x0: Math.sqrt(q),
      lo: { at: 0, known: true },
      hi: { at: farthest, known: false },
      increasing: true,
      tolerance: 1e-12,
    });
    region.push({ ...at(rho ?? farthest), closed: rho !== null });
  }
  return region;
}

// ---------------------------------------------------------------------------------------------
// Median-rank regression

export interface MedianRank {
  t: number;
  /** Order number j: 1, 2, 3, … for complete data; Johnson's adjusted number with censoring. */
  rank: number;
  /** Bernard's median rank (j − 0.3)/(n + 0.4). */
  F: number;
}

/**
 * Median ranks of the events, in time order: units sorted by time (at a tie, events before
 * censorings; tied events keep consecutive numbers), each event's order number
 * j_k = j_{k−1} + (n + 1 − j_{k−1})/(1 + units from this one onward) (Johnson's adjustment for
 * censoring; 1, 2, 3, … with none), and F = (j − 0.3)/(n + 0.4) (Bernard). Common practice
 * (Abernethy, The New Weibull Handbook — from memory). Zero times are left out; throws on negative
 * or non-finite times.
 */
export function medianRanks(
  times: readonly number[],
  events: readonly boolean[] = times.map(() => true),
): MedianRank[] {
  return medianRanksOf(positiveLives(times, events));
}

function medianRanksOf(data: LifeData): MedianRank[] {
  const n = data.times.length;
  const order = data.times
    .map((t, i) => ({ t, e: data.events[i]! }))
    .sort((a, b) => a.t - b.t || Number(b.e) - Number(a.e));
  const ranks: MedianRank[] = [];
  let previous = 0;
  order.forEach(({ t, e }, k) => {
    if (!e) return;
    previous += (n + 1 - previous) / (1 + (n - k));
    ranks.push({ t, rank: previous, F: (previous - 0.3) / (n + 0.4) });
  });
  return ranks;
}

export type RegressionLine = WeibullParams;

export interface MedianRankRegression {
  /** Least squares of y = ln(−ln(1 − F)) on x = ln t: y = β·x − β·ln η. */
  yOnX: RegressionLine;
  /** Least squares of x on y: x = y/β + ln η. */
  xOnY: RegressionLine;
  /** Pearson correlation of x and y over the events. */
  correlation: number;
  n: number;
  events: number;
  excludedZeroTimes: number;
}

export type MedianRankRegressionResult =
  { fit: MedianRankRegression; reason?: undefined } | { fit: null; reason: NullReason; n: number; events: number };

/**
 * Weibull median-rank regression (probability-plot fit), common practice: order the units by time
 * (at a tie, events before censorings; tied events keep consecutive ranks), give each event a
 * median rank F = (j − 0.3)/(n + 0.4) (Bernard's approximation), where j is its order number, or —
 * with censoring — Johnson's adjusted order number j_k = j_{k−1} + (n + 1 − j_{k−1})/(1 + units
 * from this one onward); fit a straight line to x = ln t, y = ln(−ln(1 − F)) both ways.
 * `events` defaults to all true (complete data). Null ('too-few-events') with fewer than two events
 * or all events at one time; 'no-data' with no units. Zero times are left out and counted; throws on
 * negative or non-finite times.
 */
export function weibullMedianRankRegression(
  times: readonly number[],
  events: readonly boolean[] = times.map(() => true),
): MedianRankRegressionResult {
  const data = positiveLives(times, events);
  const n = data.times.length;
  const ranks = medianRanksOf(data);
  const xs = ranks.map((p) => Math.log(p.t));
  const ys = ranks.map((p) => Math.log(-Math.log(1 - p.F)));
  const r = xs.length;
  if (n === 0) return { fit: null, reason: 'no-data', n, events: r };
  if (r < 2 || xs.every((x) => x === xs[0])) return { fit: null, reason: 'too-few-events', n, events: r };
  const mx = xs.reduce((s, x) => s + x, 0) / r;
  const my = ys.reduce((s, y) => s + y, 0) / r;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < r; i++) {
    sxx += (xs[i]! - mx) ** 2;
    syy += (ys[i]! - my) ** 2;
    sxy += (xs[i]! - mx) * (ys[i]! - my);
  }
  const slopeYX = sxy / sxx; // = β
  const slopeXY = sxy / syy; // = 1/β
  return {
    fit: {
      yOnX: { shape: slopeYX, scale: Math.exp(mx - my / slopeYX) },
      xOnY: { shape: 1 / slopeXY, scale: Math.exp(mx - slopeXY * my) },
      correlation: sxy / Math.sqrt(sxx * syy),
      n,
      events: r,
      excludedZeroTimes: data.excludedZeroTimes,
    },
  };
}

// ---------------------------------------------------------------------------------------------
// Life figures from a fit

function checkParams({ shape, scale }: WeibullParams): void {
  assertFinite(shape, 'shape');
  assertFinite(scale, 'scale');
  if (shape <= 0 || scale <= 0) throw new RangeError('Weibull shape and scale must be > 0.');
}

/** Weibull p-quantile (B_{100p} life) η·(−ln(1 − p))^{1/β}, in the unit of η; p in [0, 1). */
export function weibullQuantile(params: WeibullParams, p: number): number {
  checkParams(params);
  assertProbability(p, 'p', { open: false });
  if (p === 1) throw new RangeError('The 1-quantile of a Weibull distribution is infinite.');
  return params.scale * (-Math.log1p(-p)) ** (1 / params.shape);
}

/** Reliability (survival) R(t) = exp(−(t/η)^β), t ≥ 0 in the unit of η. NIST e-Handbook §8.1.6.2. */
export function weibullReliability(params: WeibullParams, t: number): number {
  checkParams(params);
  assertFinite(t, 't');
  if (t < 0) throw new RangeError(`t must be ≥ 0, got ${t}.`);
  return Math.exp(-((t / params.scale) ** params.shape));
}

/**
 * Probability that a unit that has survived to age a has a life-ending event within the next h:
 * 1 − R(a + h)/R(a) = 1 − exp((a/η)^β − ((a + h)/η)^β) (docs/design.md §6). a, h ≥ 0 in the unit of η.
 */
export function weibullConditionalFailureProbability(params: WeibullParams, age: number, horizon: number): number {
  checkParams(params);
  assertFinite(age, 'age');
  assertFinite(horizon, 'horizon');
  if (age < 0 || horizon < 0) throw new RangeError('age and horizon must be ≥ 0.');
  const { shape, scale } = params;
  // 0 − expm1(x) rather than −expm1(x): a zero horizon gives +0, not −0.
  return 0 - Math.expm1((age / scale) ** shape - ((age + horizon) / scale) ** shape);
}

export interface WeibullLifeStats {
  /** B10 life: the age by which 10 % have had a life-ending event, η(−ln 0.9)^{1/β}. */
  b10: number;
  /** Median (B50) life η(ln 2)^{1/β}. */
  median: number;
  /** Mean life η·Γ(1 + 1/β) (Γ from jstat). */
  mean: number;
}

/**
 * B10, median and mean life of a Weibull(β, η), in the unit of η (NIST e-Handbook §8.1.6.2 for
 * the mean η·Γ(1 + 1/β)). Throws on a non-positive or non-finite parameter.
 */
export function weibullLifeStats(params: WeibullParams): WeibullLifeStats {
  checkParams(params);
  return {
    b10: weibullQuantile(params, 0.1),
    median: weibullQuantile(params, 0.5),
    mean: params.scale * gammaFunction(1 + 1 / params.shape),
  };
}

function maxOf(values: readonly number[]): number {
  let max = -Infinity;
  for (const x of values) if (x > max) max = x;
  return max;
}
