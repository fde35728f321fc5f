// Small statistical helpers shared by the KPI modules: distribution quantiles (through jstat, a
// reference library, rather than home-made approximations), sample summaries and the "null with a
// reason" result every undefined ratio uses instead of NaN or Infinity.
import jstat from 'jstat';

import { type NullReason } from '#shared/schemas/answer.ts';
import { quantileMethodType7 } from '#shared/schemas/time-to-complete.ts';

/**
 * Why a KPI value is null: kebab-case codes listed with the API schemas, since answers
 * carry them; `nullReasonMessages` turns a code into a sentence.
 */
export { nullReasons, type NullReason } from '#shared/schemas/answer.ts';

export { nullReasonMessages } from './null-reasons.ts';

/** A number, or null with the reason it is undefined. Never NaN or Infinity. */
export type Ratio = { value: number; reason?: undefined } | { value: null; reason: NullReason };

export function valueOf(value: number): Ratio {
  if (!Number.isFinite(value)) throw new RangeError(`A KPI value must be finite, got ${value}.`);
  return { value };
}

export function nullBecause(reason: NullReason): Ratio {
  return { value: null, reason };
}

/** numerator / denominator, or null with `reasonIfZero` when the denominator is 0. */
export function ratio(numerator: number, denominator: number, reasonIfZero: NullReason): Ratio {
  assertFinite(numerator, 'numerator');
  assertFinite(denominator, 'denominator');
  if (denominator === 0) return nullBecause(reasonIfZero);
  return valueOf(numerator / denominator);
}

export function assertFinite(x: number, what: string): void {
  if (typeof x !== 'number' || !Number.isFinite(x))
    throw new RangeError(`${what} must be a finite number, got ${String(x)}.`);
}

export function assertProbability(p: number, what: string, { open }: { open: boolean }): void {
  assertFinite(p, what);
  if (open ? !(p > 0 && p < 1) : !(p >= 0 && p <= 1)) {
    throw new RangeError(`${what} must lie in ${open ? '(0, 1)' : '[0, 1]'}, got ${p}.`);
  }
}

function assertValues(values: readonly number[], what: string): void {
  values.forEach((x, i) => assertFinite(x, `${what}[${i}]`));
}

/**
 * Chi-square p-quantile χ²_p(ν): the value a chi-square variable with ν degrees of freedom falls
 * below with probability p (the lower-tail convention of NIST/SEMATECH e-Handbook §8.4.5.1).
 * Computed by jstat (`jStat.chisquare.inv`). Throws on p outside (0, 1) or ν ≤ 0.
 */
export function chiSquareQuantile(p: number, degreesOfFreedom: number): number {
  assertProbability(p, 'p', { open: true });
  assertFinite(degreesOfFreedom, 'degreesOfFreedom');
  if (degreesOfFreedom <= 0) throw new RangeError(`degreesOfFreedom must be > 0, got ${degreesOfFreedom}.`);
  return jstat.jStat.chisquare.inv(p, degreesOfFreedom);
}

/** Standard normal p-quantile z_p (jstat). z_0.975 = 1.959963984540054. Throws on p outside (0, 1). */
export function normalQuantile(p: number): number {
  assertProbability(p, 'p', { open: true });
  return jstat.jStat.normal.inv(p, 0, 1);
}

/** Gamma function Γ(x) for x > 0 (jstat's Lanczos implementation). */
export function gammaFunction(x: number): number {
  assertFinite(x, 'x');
  if (x <= 0) throw new RangeError(`gammaFunction is used for x > 0 only, got ${x}.`);
  return jstat.jStat.gammafn(x);
}

/** The quantile definition every KPI answer states (`quantileMethod`). */
export const quantileMethod = quantileMethodType7;

/**
 * Sample quantile, definition 7 of Hyndman & Fan (1996), the default of R `quantile` and numpy
 * `quantile(method='linear')`: with the values sorted x[0] ≤ … ≤ x[n−1] and h = (n − 1)·p,
 * Q(p) = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋]).
 *
 * Written out here rather than taken from simple-statistics: its `quantileSorted` switched to this
 * definition only in 7.9.0 (earlier releases used an n·p rule), so spelling it out keeps the answer
 * independent of the installed version. The tests compare it with simple-statistics 7.12.1.
 * Returns null ('no-data') for no values; throws on p outside [0, 1] or a non-finite value.
 */
export function quantileType7(values: readonly number[], p: number): Ratio {
  assertProbability(p, 'p', { open: false });
  assertValues(values, 'values');
  if (values.length === 0) return nullBecause('no-data');
  const sorted = [...values].sort((a, b) => a - b);
  return valueOf(quantileType7Sorted(sorted, p));
}

/** quantileType7 on values already sorted ascending (not checked); n ≥ 1. */
export function quantileType7Sorted(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** Arithmetic mean; null ('no-data') for no values. */
export function mean(values: readonly number[]): Ratio {
  assertValues(values, 'values');
  if (values.length === 0) return nullBecause('no-data');
  let sum = 0;
  for (const x of values) sum += x;
  return valueOf(sum / values.length);
}

/** Median = type-7 quantile at p = 0.5 (the middle value, or the mean of the two middle values). */
export function median(values: readonly number[]): Ratio {
  return quantileType7(values, 0.5);
}

/**
 * Sample standard deviation with the n − 1 divisor, √(Σ(x − x̄)²/(n − 1)), two-pass for accuracy.
 * Null ('too-few-values') for fewer than two values.
 */
export function sampleSd(values: readonly number[]): Ratio {
  assertValues(values, 'values');
  if (values.length < 2) return nullBecause('too-few-values');
  const m = mean(values).value!;
  let ss = 0;
  for (const x of values) ss += (x - m) ** 2;
  return valueOf(Math.sqrt(ss / (values.length - 1)));
}

/** A search range end: where it is, and whether the function is known to have the sign of that side there. */
export interface RootBound {
  at: number;
  /** true when f(at) is known to be on that side of zero (the caller evaluated it, or it follows from the maths). */
  known: boolean;
}

/**
 * Root of a monotone function f on [lo, hi] by Newton's method, safeguarded as in Numerical Recipes'
 * `rtsafe` (Press et al., ch. 9.4 — from memory): every evaluation narrows the bracket to the side it
 * falls on, and a Newton step that would leave the bracket (or a zero or non-finite derivative)
 * bisects it instead. An end not `known` is evaluated only when a step reaches it; if f has not
 * changed sign there, there is no root in the range and the answer is null. `fdf` returns f(x) and
 * f'(x); `increasing` says which way f runs; lo and hi must be finite. Stops when the step or the bracket is below
 * tolerance·max(1, |x|). A NaN value counts as "past the root" (an overflow far out in the range).
 */
export function monotoneRoot(
  fdf: (x: number) => readonly [number, number],
  options: { x0: number; lo: RootBound; hi: RootBound; increasing: boolean; tolerance?: number },
): number | null {
  const tolerance = options.tolerance ?? 1e-13;
  const sign = options.increasing ? 1 : -1;
  // Work on g = sign·f, increasing: g < 0 below the root, g > 0 above it.
  let lo = options.lo.at;
  let hi = options.hi.at;
  let loKnown = options.lo.known;
  let hiKnown = options.hi.known;
  let x = Math.min(Math.max(options.x0, lo), hi);
  for (let i = 0; i < 200; i++) {
    const [f, df] = fdf(x);
    const g = Number.isNaN(f) ? Infinity : sign * f;
    if (g === 0) return x;
    if (g < 0) {
      if (x === hi && !hiKnown) return null;
      lo = x;
      loKnown = true;
    } else {
      if (x === lo && !loKnown) return null;
      hi = x;
      hiKnown = true;
    }
    const scale = tolerance * Math.max(1, Math.abs(x));
    if (loKnown && hiKnown && hi - lo <= scale) return x;
    const newton = x - f / df;
    let next = newton;
    if (!Number.isFinite(newton) || newton <= lo || newton >= hi) {
      if (loKnown && hiKnown) next = (lo + hi) / 2;
      // Root above x, top end not yet seen: go to it if Newton overshoots it, else halfway there.
      else if (g < 0) next = newton >= hi ? hi : x + (hi - x) / 2;
      else next = newton <= lo ? lo : x - (x - lo) / 2;
    }
    if (Math.abs(next - x) <= scale) return next;
    x = next;
  }
  return x;
}
