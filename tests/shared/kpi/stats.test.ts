import { quantileSorted } from 'simple-statistics';
import { describe, expect, it } from 'vitest';

import {
  monotoneRoot,
  chiSquareQuantile,
  gammaFunction,
  mean,
  median,
  normalQuantile,
  quantileMethod,
  quantileType7,
  ratio,
  sampleSd,
} from '#shared/kpi/stats.ts';

const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

describe('chi-square quantiles', () => {
  // Published chi-square table values, 3 decimals (the usual textbook table; NIST/SEMATECH
  // e-Handbook §1.3.6.7.4 prints the same critical values) — from memory.
  const table: Array<[p: number, dof: number, value: number]> = [
    [0.95, 1, 3.841],
    [0.95, 2, 5.991],
    [0.95, 4, 9.488],
    [0.95, 6, 12.592],
    [0.95, 10, 18.307],
    [0.9, 4, 7.779],
    [0.975, 6, 14.449],
    [0.99, 5, 15.086],
    [0.05, 4, 0.711],
    [0.05, 10, 3.94],
    [0.025, 4, 0.484],
  ];
  it.each(table)('χ²_%s(%s) matches the printed table value %s to 3 decimals', (p, dof, value) => {
    expect(Math.abs(chiSquareQuantile(p, dof) - value)).toBeLessThanOrEqual(0.0005 + 1e-12);
  });

  it('matches the reference checks computed with scipy chi2.ppf (rel 1e-5)', () => {
    // Project reference checks, id mtbf.chi2.nist_8451_example (scipy chi2.ppf): chi2_0.95(6), chi2_0.05(4).
    expect(relErr(chiSquareQuantile(0.95, 6), 12.59158724)).toBeLessThan(1e-5);
    expect(relErr(chiSquareQuantile(0.05, 4), 0.7107230214)).toBeLessThan(1e-5);
  });

  // Closed forms (textbook identities): χ²(2) is exponential with mean 2, so χ²_p(2) = −2 ln(1 − p);
  // χ²(1) is a squared standard normal, so χ²_p(1) = z_{(1+p)/2}².
  it.each([0.001, 0.05, 0.4, 0.9, 0.975, 0.999])('χ²_p(2) = −2 ln(1 − p) at p = %s', (p) => {
    expect(relErr(chiSquareQuantile(p, 2), -2 * Math.log(1 - p))).toBeLessThan(1e-10);
  });
  it.each([0.1, 0.5, 0.9, 0.95, 0.99])('χ²_p(1) = z_{(1+p)/2}² at p = %s', (p) => {
    expect(relErr(chiSquareQuantile(p, 1), normalQuantile((1 + p) / 2) ** 2)).toBeLessThan(1e-9);
  });

  it('refuses p outside (0, 1) and non-positive degrees of freedom', () => {
    expect(() => chiSquareQuantile(0, 2)).toThrow(RangeError);
    expect(() => chiSquareQuantile(1, 2)).toThrow(RangeError);
    expect(() => chiSquareQuantile(0.5, 0)).toThrow(RangeError);
    expect(() => chiSquareQuantile(Number.NaN, 2)).toThrow(RangeError);
  });
});

describe('normal quantile and gamma function', () => {
  it('z_0.975 = 1.959963984540054 (reference checks, conventions)', () => {
    expect(Math.abs(normalQuantile(0.975) - 1.959963984540054)).toBeLessThan(1e-12);
  });
  it.each([
    [1.5, Math.sqrt(Math.PI) / 2], // Γ(3/2) = √π/2, textbook identity
    [5, 24], // Γ(n) = (n − 1)!
    [1, 1],
    [4 / 3, 0.8929795115692492], // Γ(4/3), from memory (Abramowitz & Stegun table 6.1: 0.89297 95116)
  ])('Γ(%s) = %s', (x, value) => {
    expect(relErr(gammaFunction(x), value)).toBeLessThan(1e-8);
  });
});

// Reference check quantile.definitions (Hyndman & Fan 1996 type 7; numpy.quantile; invented data).
const jobs = [4.5, 12.0, 2.5, 30.0, 6.0, 3.0, 16.0, 7.5, 4.0, 8.0];
const docExample = [3, 6, 7, 8, 8, 9, 10, 13, 15, 16, 20]; // simple-statistics documentation example
const ps = [0.0, 0.1, 0.2, 0.25, 0.3, 0.5, 0.7, 0.75, 0.8, 0.9, 0.95, 1.0];
const jobsType7 = [2.5, 2.95, 3.8, 4.125, 4.35, 6.75, 9.2, 11.0, 12.8, 17.4, 23.7, 30.0];
const docType7 = [3.0, 6.0, 7.0, 7.5, 8.0, 9.0, 13.0, 14.0, 15.0, 16.0, 18.0, 20.0];
// The same p under simple-statistics ≤ 7.8.x (idx = n·p rule) give 4 / 6.75 / 23 / 30 at
// p = 0.25 / 0.5 / 0.9 / 0.95 for the jobs: a different definition, which Osmia does not use.

describe('type-7 sample quantile', () => {
  it('states its definition', () => {
    expect(quantileMethod).toBe('type7 (Hyndman & Fan 1996; R default)');
  });

  it.each(ps.map((p, i) => [p, jobsType7[i]!, docType7[i]!]))(
    'p = %s: jobs %s, documentation example %s (abs 1e-9)',
    (p, jobsValue, docValue) => {
      expect(Math.abs(quantileType7(jobs, p).value! - jobsValue)).toBeLessThan(1e-9);
      expect(Math.abs(quantileType7(docExample, p).value! - docValue)).toBeLessThan(1e-9);
    },
  );

  it('agrees with simple-statistics 7.12.1 quantileSorted (type 7 since 7.9.0)', () => {
    const sorted = [...jobs].sort((a, b) => a - b);
    for (const p of ps) expect(quantileType7(jobs, p).value).toBeCloseTo(quantileSorted(sorted, p), 12);
  });

  it('gives 9 as the median of the simple-statistics documentation example (published)', () => {
    expect(median(docExample).value).toBe(9);
  });

  it('does not reorder its input', () => {
    const input = [3, 1, 2];
    quantileType7(input, 0.5);
    expect(input).toEqual([3, 1, 2]);
  });

  it('is null with a reason for no values, and refuses p outside [0, 1]', () => {
    expect(quantileType7([], 0.5)).toEqual({ value: null, reason: 'no-data' });
    expect(() => quantileType7(jobs, 1.1)).toThrow(RangeError);
    expect(() => quantileType7([1, Number.NaN], 0.5)).toThrow(RangeError);
  });
});

describe('mean, sample sd, median', () => {
  it('mean 9.35 and sample sd 8.389974176 of the job durations (reference checks)', () => {
    expect(Math.abs(mean(jobs).value! - 9.35)).toBeLessThan(1e-9);
    expect(Math.abs(sampleSd(jobs).value! - 8.389974176)).toBeLessThan(1e-9);
    expect(median(jobs).value).toBe(6.75);
  });

  it('sd of two values is |a − b|/√2 (hand-worked)', () => {
    expect(sampleSd([1, 3]).value).toBeCloseTo(Math.SQRT2, 14);
  });

  it('is null with a reason when undefined', () => {
    expect(mean([])).toEqual({ value: null, reason: 'no-data' });
    expect(median([])).toEqual({ value: null, reason: 'no-data' });
    expect(sampleSd([4])).toEqual({ value: null, reason: 'too-few-values' });
  });
});

describe('ratio', () => {
  it('divides, or is null with the given reason on a zero denominator', () => {
    expect(ratio(3, 4, 'no-time')).toEqual({ value: 0.75 });
    expect(ratio(3, 0, 'no-time')).toEqual({ value: null, reason: 'no-time' });
    expect(ratio(0, 0, 'no-failures')).toEqual({ value: null, reason: 'no-failures' });
  });
  it('refuses non-finite input rather than answering NaN', () => {
    expect(() => ratio(Number.POSITIVE_INFINITY, 1, 'no-time')).toThrow(RangeError);
  });
});

describe('monotone root (safeguarded Newton)', () => {
  const known = (at: number) => ({ at, known: true });
  const unknown = (at: number) => ({ at, known: false });
  it('finds √2 as the root of x² − 2 on [0, 2], from either end', () => {
    const f = (x: number) => [x * x - 2, 2 * x] as const;
    expect(monotoneRoot(f, { x0: 0, lo: known(0), hi: known(2), increasing: true })).toBeCloseTo(Math.SQRT2, 12);
    expect(monotoneRoot(f, { x0: 2, lo: known(0), hi: known(2), increasing: true })).toBeCloseTo(Math.SQRT2, 12);
  });
  it('follows a decreasing function', () => {
    // e^{−x} = 0.5 at x = ln 2
    const f = (x: number) => [Math.exp(-x) - 0.5, -Math.exp(-x)] as const;
    expect(monotoneRoot(f, { x0: 5, lo: unknown(-10), hi: unknown(10), increasing: false })).toBeCloseTo(Math.LN2, 12);
  });
  it('falls back to bisection where Newton steps run away (flat derivative, infinite end)', () => {
    const f = (x: number) => [x > 0.99 ? Infinity : x - 0.25, x > 0.99 ? NaN : 0] as const;
    expect(monotoneRoot(f, { x0: 0.9, lo: known(0), hi: known(1), increasing: true })).toBeCloseTo(0.25, 12);
    // tanh is nearly flat far out: Newton from x = 4 would jump far past the root at 0.5.
    const g = (x: number) => [Math.tanh(x) - Math.tanh(0.5), 1 - Math.tanh(x) ** 2] as const;
    expect(monotoneRoot(g, { x0: 4, lo: unknown(-20), hi: unknown(20), increasing: true })).toBeCloseTo(0.5, 12);
  });
  it('answers null when the function has not changed sign at an end not known', () => {
    // x − 5 is still negative at 3
    const f = (x: number) => [x - 5, 1] as const;
    expect(monotoneRoot(f, { x0: 1, lo: known(0), hi: unknown(3), increasing: true })).toBeNull();
    expect(monotoneRoot(f, { x0: 1, lo: known(0), hi: unknown(6), increasing: true })).toBeCloseTo(5, 12);
  });
});
