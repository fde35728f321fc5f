// Element replacement forecast: expected life-ending events and their cost, period by period
// (normally the next 12 calendar months, whose boundaries the caller works out in the site's
// time zone), from a Weibull fit of element life and the ages of the elements now in service.
import { type WeibullParams } from './element-life.ts';
import { assertFinite } from './stats.ts';

const DAY_MS = 86_400_000;

export interface ForecastElement {
  /** Serial number or other label, echoed back. */
  id: string;
  /** Age at `asOf`, days (real elapsed time since installation). */
  ageDays: number;
  /** What one replacement of this element costs (element and labour), in the plant's currency. */
  replacementCost: number;
}

export interface ForecastPeriod {
  label: string;
  /** Half-open [start, end); start ≥ asOf. */
  start: Date;
  end: Date;
}

export interface ReplacementForecastInput {
  asOf: Date;
  elements: readonly ForecastElement[];
  periods: readonly ForecastPeriod[];
  /** The Weibull fit of element life, in days. */
  fit: WeibullParams;
  /**
   * Points on the boundary of the fit's confidence region (weibullConfidenceRegion with dof 1).
   * The band is the range of each figure over these points and the fit; omit for no band.
   */
  region?: readonly WeibullParams[];
  /**
   * false (default): first life-ending event of each element in service, as docs/design.md §6 states it.
   * true: also count failures of the replacements themselves, each installed at the end of the
   * period in which its predecessor failed (a discrete renewal equation).
   */
  renewal?: boolean;
}

export interface ForecastFigures {
  expectedCount: number;
  expectedCost: number;
  countLower: number | null;
  countUpper: number | null;
  costLower: number | null;
  costUpper: number | null;
}

export interface ForecastPeriodResult extends ForecastFigures {
  label: string;
  start: Date;
  end: Date;
}

export interface ForecastResult {
  asOf: Date;
  inService: number;
  periods: ForecastPeriodResult[];
  total: ForecastFigures;
  /** Per element: probability of a life-ending event before the end of the last period. */
  elements: Array<{ id: string; ageDays: number; probability: number }>;
  renewal: boolean;
  bandMethod: string;
}

export const forecastBandMethod =
  'range over the boundary of the likelihood-ratio confidence region of (shape, scale) at chi-square(1): ' +
  'a profile-likelihood interval for each figure, evaluated at the region points given';

/**
 * Replacement forecast. With H(x) = (x/η)^β the Weibull cumulative hazard and an element of age a
 * today, period k = [s_k, e_k) days from today:
 * - conditional probability in the period, given survival to its start: 1 − exp(H(a+s) − H(a+e))
 *   (docs/design.md §6's "probability within h");
 * - probability from today, given survival to today, of the event falling in the period:
 *   P_k = [R(a+s) − R(a+e)]/R(a) = exp(H(a) − H(a+s))·(1 − exp(H(a+s) − H(a+e))).
 * Expected count in period k = Σ P_k over elements in service; expected cost = Σ P_k × the element's
 * replacement cost. The periods' P_k add up to the probability of an event before the last end.
 * With `renewal`, replacement failures are added: M_k = F_k + Σ_{j<k} M_j·q_{j,k}, where q_{j,k} is
 * the chance that a new element installed at e_j fails in period k (same for cost).
 * Band: see `forecastBandMethod` (Meeker & Escobar, Statistical Methods for Reliability Data, ch. 8,
 * likelihood-based intervals for functions of the parameters — from memory); null without a region.
 * Degenerate input: no elements → every figure 0 (no band needed: 0 for every point); no periods →
 * empty list and totals 0. Throws on negative ages or costs, non-positive parameters, or a period
 * that starts before asOf or does not end after it starts.
 */
export function forecastReplacements(input: ReplacementForecastInput): ForecastResult {
  const { asOf, elements, periods, fit } = input;
  const renewal = input.renewal ?? false;
  if (!Number.isFinite(asOf.getTime())) throw new RangeError('asOf is not a valid date.');
  checkParams(fit, 'fit');
  elements.forEach((el, i) => {
    assertFinite(el.ageDays, `elements[${i}].ageDays`);
    assertFinite(el.replacementCost, `elements[${i}].replacementCost`);
    if (el.ageDays < 0) throw new RangeError(`elements[${i}].ageDays must be ≥ 0.`);
    if (el.replacementCost < 0) throw new RangeError(`elements[${i}].replacementCost must be ≥ 0.`);
  });
  const spans = periods.map((p, k) => {
    const s = (p.start.getTime() - asOf.getTime()) / DAY_MS;
    const e = (p.end.getTime() - asOf.getTime()) / DAY_MS;
    if (!Number.isFinite(s) || !Number.isFinite(e)) throw new RangeError(`periods[${k}] has an invalid date.`);
    if (s < 0) throw new RangeError(`periods[${k}] starts before asOf.`);
    if (!(e > s)) throw new RangeError(`periods[${k}] must end after it starts.`);
    return { s, e };
  });
  (input.region ?? []).forEach((p, i) => checkParams(p, `region[${i}]`));

  const ages = logAges(elements, spans);
  const central = evaluate(fit, elements, spans, ages, renewal);
  const variants =
    input.region && input.region.length > 0
      ? [central, ...input.region.map((p) => evaluate(p, elements, spans, ages, renewal))]
      : null;
  const band = (pick: (v: Evaluation) => number): { lower: number | null; upper: number | null } => {
    if (variants === null) return { lower: null, upper: null };
    const values = variants.map(pick);
    return { lower: Math.min(...values), upper: Math.max(...values) };
  };
  const figures = (pickCount: (v: Evaluation) => number, pickCost: (v: Evaluation) => number): ForecastFigures => {
    const count = band(pickCount);
    const cost = band(pickCost);
    return {
      expectedCount: pickCount(central),
      expectedCost: pickCost(central),
      countLower: count.lower,
      countUpper: count.upper,
      costLower: cost.lower,
      costUpper: cost.upper,
    };
  };
  return {
    asOf,
    inService: elements.length,
    periods: periods.map((p, k) => ({
      label: p.label,
      start: p.start,
      end: p.end,
      ...figures(
        (v) => v.counts[k]!,
        (v) => v.costs[k]!,
      ),
    })),
    total: figures(
      (v) => sum(v.counts),
      (v) => sum(v.costs),
    ),
    elements: elements.map((el, i) => ({
      id: el.id,
      ageDays: el.ageDays,
      probability: central.firstEventProbability[i]!,
    })),
    renewal,
    bandMethod: forecastBandMethod,
  };
}

interface Evaluation {
  counts: number[];
  costs: number[];
  firstEventProbability: number[];
}

/**
 * ln of each element's age today and at each period's start and end, taken once: every fit evaluated
 * (the estimate and each region point) then gets H(x) = (x/η)^β as exp(β(ln x − ln η)), one
 * exponential instead of a power.
 */
interface LogAges {
  /** Per element: ln a, then ln(a + s_k), ln(a + e_k) for each period k. */
  values: Float64Array;
  stride: number;
}

function logAges(elements: readonly ForecastElement[], spans: ReadonlyArray<{ s: number; e: number }>): LogAges {
  const stride = 1 + 2 * spans.length;
  const values = new Float64Array(elements.length * stride);
  elements.forEach((el, i) => {
    const at = i * stride;
    values[at] = Math.log(el.ageDays); // −∞ for a new element: H(0) = 0
    spans.forEach(({ s, e }, k) => {
      values[at + 1 + 2 * k] = Math.log(el.ageDays + s);
      values[at + 2 + 2 * k] = Math.log(el.ageDays + e);
    });
  });
  return { values, stride };
}

function evaluate(
  params: WeibullParams,
  elements: readonly ForecastElement[],
  spans: ReadonlyArray<{ s: number; e: number }>,
  ages: LogAges,
  renewal: boolean,
): Evaluation {
  const H = (x: number): number => (x / params.scale) ** params.shape;
  const lnScale = Math.log(params.scale);
  const hOf = (lnX: number): number => Math.exp(params.shape * (lnX - lnScale));
  const counts = spans.map(() => 0);
  const costs = spans.map(() => 0);
  const firstEventProbability = elements.map((el, i) => {
    const at = i * ages.stride;
    const hAge = hOf(ages.values[at]!);
    let total = 0;
    // Back-to-back periods (the usual calendar months) share a boundary: H there, and the survival
    // to it, carry over from the period before.
    let lnEnd = NaN;
    let hEnd = NaN;
    let survivalToEnd = NaN;
    for (let k = 0; k < spans.length; k++) {
      const lnStart = ages.values[at + 1 + 2 * k]!;
      const contiguous = lnStart === lnEnd;
      const hStart = contiguous ? hEnd : hOf(lnStart);
      const survival = contiguous ? survivalToEnd : Math.exp(hAge - hStart);
      lnEnd = ages.values[at + 2 + 2 * k]!;
      hEnd = hOf(lnEnd);
      const inPeriod = Math.expm1(hStart - hEnd);
      survivalToEnd = survival * (1 + inPeriod);
      let p = survival * (0 - inPeriod);
      // A cumulative hazard too large for a double (an element far past its life at an extreme
      // point of the region) gives ∞ − ∞; its limit is an event at once: all that is left, now.
      if (Number.isNaN(p)) p = Math.max(0, 1 - total);
      counts[k]! += p;
      costs[k]! += p * el.replacementCost;
      total += p;
    }
    return total;
  });
  if (renewal) {
    // A replacement installed at the end of period j is new (age 0) then.
    for (let k = 0; k < spans.length; k++) {
      for (let j = 0; j < k; j++) {
        const installed = spans[j]!.e;
        const { s, e } = spans[k]!;
        if (s < installed) continue;
        const q = Math.exp(-H(s - installed)) * (0 - Math.expm1(H(s - installed) - H(e - installed)));
        counts[k]! += counts[j]! * q;
        costs[k]! += costs[j]! * q;
      }
    }
  }
  return { counts, costs, firstEventProbability };
}

function checkParams({ shape, scale }: WeibullParams, what: string): void {
  assertFinite(shape, `${what}.shape`);
  assertFinite(scale, `${what}.scale`);
  if (shape <= 0 || scale <= 0) throw new RangeError(`${what}: Weibull shape and scale must be > 0.`);
}

function sum(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0);
}
