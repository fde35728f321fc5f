import { describe, expect, it } from 'vitest';

import { fitWeibull, weibullConfidenceRegion, weibullReliability } from '#shared/kpi/element-life.ts';
import { forecastReplacements, type ForecastPeriod } from '#shared/kpi/forecast.ts';

const DAY = 86_400_000;
const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);
const asOf = new Date('2026-01-01T00:00:00Z');

/** Periods of the given lengths in days, back to back from asOf. */
const periodsOf = (lengths: number[]): ForecastPeriod[] => {
  let start = asOf.getTime();
  return lengths.map((days, i) => {
    const period = { label: `m${i + 1}`, start: new Date(start), end: new Date(start + days * DAY) };
    start += days * DAY;
    return period;
  });
};

// Calendar months of 2026 (UTC): Jan 31, Feb 28, Mar 31, Apr 30, …
const months2026 = periodsOf([31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]);

// Ball-bearing MLE (Lieblein & Zelen 1956; reference checks), used here as if in days.
const bearingFit = { shape: 2.102058875, scale: 81.87833405 };

describe('replacement forecast, first events', () => {
  it('matches the conditional failure probability of the reference check: age 60, next 20 → 0.3509006309 (rel 1e-4)', () => {
    const result = forecastReplacements({
      asOf,
      elements: [{ id: 'E1', ageDays: 60, replacementCost: 1000 }],
      periods: periodsOf([20]),
      fit: bearingFit,
    });
    expect(relErr(result.periods[0]!.expectedCount, 0.3509006309)).toBeLessThan(1e-4);
    expect(relErr(result.periods[0]!.expectedCost, 350.9006309)).toBeLessThan(1e-4);
  });

  it('is memoryless at shape 1: each month e^{−s/η}(1 − e^{−h/η}) whatever the age (hand-worked)', () => {
    const eta = 365;
    const result = forecastReplacements({
      asOf,
      elements: [
        { id: 'young', ageDays: 10, replacementCost: 1 },
        { id: 'old', ageDays: 3000, replacementCost: 1 },
      ],
      periods: months2026.slice(0, 3),
      fit: { shape: 1, scale: eta },
    });
    const p = (s: number, h: number) => Math.exp(-s / eta) * (1 - Math.exp(-h / eta));
    expect(result.periods[0]!.expectedCount).toBeCloseTo(2 * p(0, 31), 12);
    expect(result.periods[1]!.expectedCount).toBeCloseTo(2 * p(31, 28), 12);
    expect(result.periods[2]!.expectedCount).toBeCloseTo(2 * p(59, 31), 12);
  });

  it('adds up over the months to P(event within the year | alive now) = 1 − R(a + 365)/R(a)', () => {
    const elements = [0, 30, 75, 140].map((age, i) => ({ id: `E${i}`, ageDays: age, replacementCost: 100 + i }));
    const result = forecastReplacements({ asOf, elements, periods: months2026, fit: bearingFit });
    elements.forEach((el, i) => {
      const expected =
        1 - weibullReliability(bearingFit, el.ageDays + 365) / weibullReliability(bearingFit, el.ageDays);
      expect(result.elements[i]!.probability).toBeCloseTo(expected, 12);
    });
    const totalCount = result.elements.reduce((s, e) => s + e.probability, 0);
    expect(result.total.expectedCount).toBeCloseTo(totalCount, 12);
    const totalCost = result.elements.reduce((s, e, i) => s + e.probability * elements[i]!.replacementCost, 0);
    expect(result.total.expectedCost).toBeCloseTo(totalCost, 10);
    expect(result.periods).toHaveLength(12);
    expect(result.periods[1]!.label).toBe('m2');
  });

  it('gives a later month the docs/design.md §6 conditional probability once survival to its start is factored in', () => {
    // P(event in [s, s+h) | alive at 0) = R(a+s)/R(a) · (1 − exp((a+s)^β/η^β − (a+s+h)^β/η^β)).
    const a = 50;
    const result = forecastReplacements({
      asOf,
      elements: [{ id: 'E', ageDays: a, replacementCost: 1 }],
      periods: months2026,
      fit: bearingFit,
    });
    const H = (x: number) => (x / bearingFit.scale) ** bearingFit.shape;
    const s = 31 + 28; // start of March
    const conditional = 1 - Math.exp(H(a + s) - H(a + s + 31));
    const survive = Math.exp(H(a) - H(a + s));
    expect(result.periods[2]!.expectedCount).toBeCloseTo(survive * conditional, 12);
  });
});

describe('forecast band from the fit uncertainty', () => {
  const lives = [410, 530, 620, 700, 760, 820, 900, 950, 1010, 1100, 1200, 1300, 650, 980, 1400];
  const events = lives.map((_, i) => i < 12);
  const fit = fitWeibull(lives, events).fit!;
  const region = weibullConfidenceRegion(lives, events, { confidence: 0.9 });
  const elements = [100, 400, 700, 900].map((age, i) => ({ id: `E${i}`, ageDays: age, replacementCost: 650 }));

  it('brackets the central figures and widens with the confidence level', () => {
    const result = forecastReplacements({ asOf, elements, periods: months2026, fit, region });
    for (const p of [...result.periods, result.total]) {
      expect(p.countLower!).toBeLessThanOrEqual(p.expectedCount);
      expect(p.countUpper!).toBeGreaterThanOrEqual(p.expectedCount);
      expect(p.costLower!).toBeLessThanOrEqual(p.expectedCost);
      expect(p.costUpper!).toBeGreaterThanOrEqual(p.expectedCost);
    }
    expect(result.total.countUpper! - result.total.countLower!).toBeGreaterThan(0.1);
    const wide = forecastReplacements({
      asOf,
      elements,
      periods: months2026,
      fit,
      region: weibullConfidenceRegion(lives, events, { confidence: 0.99 }),
    });
    expect(wide.total.countUpper!).toBeGreaterThan(result.total.countUpper!);
    expect(wide.total.countLower!).toBeLessThan(result.total.countLower!);
    expect(result.bandMethod).toMatch(/likelihood-ratio confidence region/);
  });

  it('gives no band without a region', () => {
    const result = forecastReplacements({ asOf, elements, periods: months2026, fit });
    expect(result.total).toMatchObject({ countLower: null, countUpper: null, costLower: null, costUpper: null });
  });

  it('region points lie on the likelihood contour 2(ℓ̂ − ℓ) = χ²_0.9(1) = 2.705543 (table value, from memory)', () => {
    const ll = (shape: number, scale: number) =>
      lives.reduce(
        (s, t, i) =>
          s + (events[i] ? Math.log(shape / scale) + (shape - 1) * Math.log(t / scale) : 0) - (t / scale) ** shape,
        0,
      );
    const top = ll(fit.shape, fit.scale);
    for (const p of region) expect(Math.abs(2 * (top - ll(p.shape, p.scale)) - 2.705543)).toBeLessThan(1e-5);
  });
});

describe('forecast with renewal', () => {
  it('at shape 1 every month has the same expected count per position (memoryless, hand-worked)', () => {
    // Month 2 = first-event part e^{−1}(1 − e^{−1}) + the replacement's (1 − e^{−1})² = 1 − e^{−1}.
    const result = forecastReplacements({
      asOf,
      elements: [{ id: 'E', ageDays: 0, replacementCost: 10 }],
      periods: periodsOf([30, 30, 30]),
      fit: { shape: 1, scale: 30 },
      renewal: true,
    });
    for (const p of result.periods) {
      expect(p.expectedCount).toBeCloseTo(1 - Math.exp(-1), 12);
      expect(p.expectedCost).toBeCloseTo(10 * (1 - Math.exp(-1)), 11);
    }
    expect(result.renewal).toBe(true);
  });

  it('never counts fewer than first events alone', () => {
    const base = {
      asOf,
      elements: [{ id: 'E', ageDays: 70, replacementCost: 1 }],
      periods: months2026,
      fit: bearingFit,
    };
    const first = forecastReplacements(base);
    const renewed = forecastReplacements({ ...base, renewal: true });
    expect(renewed.periods[0]!.expectedCount).toBeCloseTo(first.periods[0]!.expectedCount, 15);
    expect(renewed.total.expectedCount).toBeGreaterThan(first.total.expectedCount);
  });
});

describe('forecast degenerate and bad input', () => {
  it('no elements in service: zeros, and a zero band', () => {
    const result = forecastReplacements({
      asOf,
      elements: [],
      periods: months2026,
      fit: bearingFit,
      region: [{ shape: 2, scale: 80 }],
    });
    expect(result.inService).toBe(0);
    expect(result.periods.every((p) => p.expectedCount === 0 && p.expectedCost === 0 && p.countUpper === 0)).toBe(true);
  });
  it('no periods: empty list and zero totals', () => {
    const result = forecastReplacements({
      asOf,
      elements: [{ id: 'E', ageDays: 5, replacementCost: 1 }],
      periods: [],
      fit: bearingFit,
    });
    expect(result.periods).toEqual([]);
    expect(result.total.expectedCount).toBe(0);
  });
  it('refuses periods before asOf or of no length, negative ages and costs, and bad parameters', () => {
    const el = [{ id: 'E', ageDays: 5, replacementCost: 1 }];
    const before = [{ label: 'x', start: new Date(asOf.getTime() - DAY), end: asOf }];
    const empty = [{ label: 'x', start: asOf, end: asOf }];
    expect(() => forecastReplacements({ asOf, elements: el, periods: before, fit: bearingFit })).toThrow(/before asOf/);
    expect(() => forecastReplacements({ asOf, elements: el, periods: empty, fit: bearingFit })).toThrow(/end after/);
    expect(() =>
      forecastReplacements({
        asOf,
        elements: [{ id: 'E', ageDays: -1, replacementCost: 1 }],
        periods: months2026,
        fit: bearingFit,
      }),
    ).toThrow(RangeError);
    expect(() =>
      forecastReplacements({
        asOf,
        elements: [{ id: 'E', ageDays: 1, replacementCost: -1 }],
        periods: months2026,
        fit: bearingFit,
      }),
    ).toThrow(RangeError);
    expect(() =>
      forecastReplacements({ asOf, elements: el, periods: months2026, fit: { shape: 0, scale: 1 } }),
    ).toThrow(RangeError);
  });
});

describe('forecast numerics', () => {
  it('an element far past its life fails in the first period, not NaN', () => {
    // H(a) = (1e6/10)^50 overflows a double; the limit of the conditional probability is 1.
    const result = forecastReplacements({
      asOf,
      elements: [{ id: 'E', ageDays: 1e6, replacementCost: 3 }],
      periods: months2026.slice(0, 2),
      fit: { shape: 50, scale: 10 },
    });
    expect(result.periods.map((p) => p.expectedCount)).toEqual([1, 0]);
    expect(result.total.expectedCost).toBe(3);
  });
});
