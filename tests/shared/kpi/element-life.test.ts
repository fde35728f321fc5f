import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';

import {
  fitWeibull,
  kaplanMeier,
  kmRestrictedMean,
  medianRanks,
  weibullConditionalFailureProbability,
  weibullConfidenceRegion,
  weibullLifeStats,
  weibullMedianRankRegression,
  weibullQuantile,
  weibullReliability,
  type WeibullFit,
} from '#shared/kpi/element-life.ts';

const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

// Lieblein & Zelen (1956), J. Res. NBS 57(5) RP2719: 23 deep-groove ball-bearing lives, million
// revolutions (data read; as listed in the project reference checks, id weibull.complete.lieblein_zelen).
const bearings = [
  17.88, 28.92, 33.0, 41.52, 42.12, 45.6, 48.48, 51.84, 51.96, 54.12, 55.56, 67.8, 68.64, 68.64, 68.88, 84.12, 93.12,
  98.64, 105.12, 105.84, 127.92, 128.04, 173.4,
];
const allFailed = bearings.map(() => true);

const fitOf = (times: number[], events: boolean[], options = {}): WeibullFit => {
  const result = fitWeibull(times, events, options);
  if (result.fit === null) throw new Error(`no fit: ${result.reason}`);
  return result.fit;
};

describe('Weibull MLE, ball bearings (complete data)', () => {
  const fit = fitOf(bearings, allFailed);

  // Expected: reference checks (scipy weibull_min.fit(floc=0) and a score-equation solve), rel 1e-4.
  it.each([
    ['shape', fit.shape, 2.102058875],
    ['scale', fit.scale, 81.87833405],
    ['log-likelihood', fit.logLik, -113.6912909],
  ])('%s = %s ≈ %s (rel 1e-4)', (_name, actual, expected) => {
    expect(relErr(actual, expected)).toBeLessThan(1e-4);
  });

  it('matches the published shape 2.102 (Dekking et al., read) and scale 81.88 (Lawless, from memory)', () => {
    expect(Math.abs(fit.shape - 2.102)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(fit.scale - 81.88)).toBeLessThanOrEqual(0.005);
  });

  const stats = weibullLifeStats(fit);
  // Reference checks, derived from the MLE (own computation there), rel 1e-4.
  it.each([
    ['B10', stats.b10, 28.06941401],
    ['B50 (median)', stats.median, 68.77741335],
    ['mean life η·Γ(1 + 1/β)', stats.mean, 72.51865178],
    ['R(50)', weibullReliability(fit, 50), 0.7014526091],
    ['P(fail in 60–80 | survived 60)', weibullConditionalFailureProbability(fit, 60, 20), 0.3509006309],
  ])('%s = %s ≈ %s (rel 1e-4)', (_name, actual, expected) => {
    expect(relErr(actual, expected)).toBeLessThan(1e-4);
  });

  it('has 90 % likelihood-ratio intervals that contain the estimate and sit on the region boundary', () => {
    expect(fit.intervalMethod).toBe('likelihood-ratio');
    expect(fit.shapeLower).toBeLessThan(fit.shape);
    expect(fit.shapeUpper!).toBeGreaterThan(fit.shape);
    expect(fit.scaleLower).toBeLessThan(fit.scale);
    expect(fit.scaleUpper!).toBeGreaterThan(fit.scale);
    // The profile-likelihood limits are the extremes of the dof-1 likelihood region (same level),
    // found here by a different search (rays from the MLE): they must agree.
    const region = weibullConfidenceRegion(bearings, allFailed, { confidence: 0.9, points: 720 });
    const shapes = region.map((p) => p.shape);
    const scales = region.map((p) => p.scale);
    expect(relErr(Math.min(...shapes), fit.shapeLower)).toBeLessThan(1e-3);
    expect(relErr(Math.max(...shapes), fit.shapeUpper!)).toBeLessThan(1e-3);
    expect(relErr(Math.min(...scales), fit.scaleLower)).toBeLessThan(1e-3);
    expect(relErr(Math.max(...scales), fit.scaleUpper!)).toBeLessThan(1e-3);
    expect(region.every((p) => p.closed)).toBe(true);
  });

  it('gives Wald intervals from the observed information that match a finite-difference Hessian', () => {
    const wald = fitOf(bearings, allFailed, { interval: 'wald-log' });
    // Censored Weibull log-likelihood written out independently here, in (ln β, ln η).
    const ll = (a: number, b: number) => {
      const shape = Math.exp(a);
      const scale = Math.exp(b);
      let sum = 0;
      for (const t of bearings)
        sum += Math.log(shape / scale) + (shape - 1) * Math.log(t / scale) - (t / scale) ** shape;
      return sum;
    };
    const a = Math.log(wald.shape);
    const b = Math.log(wald.scale);
    const h = 1e-4;
    const haa = (ll(a + h, b) - 2 * ll(a, b) + ll(a - h, b)) / h ** 2;
    const hbb = (ll(a, b + h) - 2 * ll(a, b) + ll(a, b - h)) / h ** 2;
    const hab = (ll(a + h, b + h) - ll(a + h, b - h) - ll(a - h, b + h) + ll(a - h, b - h)) / (4 * h * h);
    const det = haa * hbb - hab * hab;
    expect(relErr(wald.covarianceLog[0][0], -hbb / det)).toBeLessThan(1e-4);
    expect(relErr(wald.covarianceLog[1][1], -haa / det)).toBeLessThan(1e-4);
    expect(relErr(wald.covarianceLog[0][1], hab / det)).toBeLessThan(1e-3);
    const z = 1.6448536269514722; // z_0.95, normal table
    expect(relErr(wald.shapeLower, wald.shape * Math.exp(-z * Math.sqrt(wald.covarianceLog[0][0])))).toBeLessThan(1e-9);
    expect(relErr(wald.scaleUpper!, wald.scale * Math.exp(z * Math.sqrt(wald.covarianceLog[1][1])))).toBeLessThan(1e-9);
  });
});

describe('Weibull median-rank regression (Bernard ranks), ball bearings', () => {
  const result = weibullMedianRankRegression(bearings);
  if (result.fit === null) throw new Error('no fit');
  const { yOnX, xOnY, correlation } = result.fit;
  // Reference checks (numpy.polyfit; method common practice), rel 1e-5.
  it.each([
    ['y on x: shape', yOnX.shape, 2.181228876],
    ['y on x: scale', yOnX.scale, 81.57757427],
    ['y on x: B10', weibullQuantile(yOnX, 0.1), 29.0743802],
    ['x on y: shape', xOnY.shape, 2.247892555],
    ['x on y: scale', xOnY.scale, 80.97235179],
    ['x on y: B10', weibullQuantile(xOnY, 0.1), 29.755287],
    ['correlation of ln t and ln(−ln(1 − F))', correlation, 0.9850603641],
  ])('%s = %s ≈ %s (rel 1e-5)', (_name, actual, expected) => {
    expect(relErr(actual, expected)).toBeLessThan(1e-5);
  });

  it('ranks tied times consecutively', () => {
    const ranks = medianRanks(bearings);
    expect(ranks.map((r) => r.rank)).toEqual(bearings.map((_, i) => i + 1));
    expect(ranks[12]!.t).toBe(68.64);
    expect(ranks[13]!.t).toBe(68.64);
    expect(ranks[0]!.F).toBeCloseTo(0.7 / 23.4, 15);
  });

  it("uses Johnson's adjusted ranks with censoring (hand-worked)", () => {
    // n = 5: 10 F, 20 S, 30 F, 40 S, 50 F. Increments (n + 1 − previous)/(1 + units from here on):
    // 6/6 = 1 → 1; (6 − 1)/(1 + 3) = 1.25 → 2.25; (6 − 2.25)/(1 + 1) = 1.875 → 4.125.
    const ranks = medianRanks([30, 10, 50, 20, 40], [true, true, true, false, false]);
    expect(ranks.map((r) => r.t)).toEqual([10, 30, 50]);
    expect(ranks.map((r) => r.rank)).toEqual([1, 2.25, 4.125]);
    expect(ranks[2]!.F).toBeCloseTo((4.125 - 0.3) / 5.4, 15);
  });

  it('puts an event before a censoring at the same time (common practice)', () => {
    // n = 3: censoring and event at 10, event at 20. The event at 10 is ranked first: 1; then
    // (4 − 1)/(1 + 1) = 1.5 → 2.5.
    expect(medianRanks([10, 10, 20], [false, true, true]).map((r) => r.rank)).toEqual([1, 2.5]);
  });

  it('needs two events at different times', () => {
    expect(weibullMedianRankRegression([5, 7], [true, false])).toMatchObject({ fit: null, reason: 'too-few-events' });
    expect(weibullMedianRankRegression([5, 5, 5])).toMatchObject({ fit: null, reason: 'too-few-events' });
    expect(weibullMedianRankRegression([])).toMatchObject({ fit: null, reason: 'no-data' });
  });
});

describe('Weibull life figures', () => {
  it('reduce to the exponential case at shape 1 (textbook: mean η, median η ln 2)', () => {
    const stats = weibullLifeStats({ shape: 1, scale: 1000 });
    expect(stats.mean).toBeCloseTo(1000, 6);
    expect(stats.median).toBeCloseTo(1000 * Math.LN2, 9);
    expect(stats.b10).toBeCloseTo(-1000 * Math.log(0.9), 9);
  });
  it('give mean η·√π/2 at shape 2 (Rayleigh, textbook)', () => {
    expect(relErr(weibullLifeStats({ shape: 2, scale: 10 }).mean, 5 * Math.sqrt(Math.PI))).toBeLessThan(1e-8);
  });
  it('R(η) = e^{−1} for any shape; conditional probability with no horizon is 0', () => {
    expect(weibullReliability({ shape: 3.3, scale: 1200 }, 1200)).toBeCloseTo(Math.exp(-1), 15);
    expect(weibullConditionalFailureProbability({ shape: 3.3, scale: 1200 }, 500, 0)).toBe(0);
  });
  it('refuse bad parameters', () => {
    expect(() => weibullLifeStats({ shape: 0, scale: 1 })).toThrow(RangeError);
    expect(() => weibullQuantile({ shape: 2, scale: 1 }, 1)).toThrow(RangeError);
    expect(() => weibullReliability({ shape: 2, scale: 1 }, -1)).toThrow(RangeError);
  });
});

describe('Weibull MLE degenerate input', () => {
  it('empty window: null, no-data', () => {
    expect(fitWeibull([], [])).toEqual({ fit: null, reason: 'no-data', n: 0, events: 0 });
  });
  it('all censored (no failures): null, no-events', () => {
    expect(fitWeibull([100, 200, 300], [false, false, false])).toEqual({
      fit: null,
      reason: 'no-events',
      n: 3,
      events: 0,
    });
  });
  it('one unit that failed: the shape diverges', () => {
    expect(fitWeibull([400], [true])).toMatchObject({ fit: null, reason: 'shape-diverges' });
  });
  it('all failed at the same age: the shape diverges', () => {
    expect(fitWeibull([730, 730, 730, 730], [true, true, true, true])).toMatchObject({
      fit: null,
      reason: 'shape-diverges',
    });
  });
  it('one failure among units running longer: a finite fit with finite intervals', () => {
    // At r = 1 the profile score is 1/β-driven; the fit exists because 900 > 300.
    const fit = fitOf([300, 600, 900], [true, false, false]);
    expect(Number.isFinite(fit.shape) && Number.isFinite(fit.scale)).toBe(true);
    expect(fit.events).toBe(1);
    expect(fit.shapeLower).toBeLessThan(fit.shape);
    // Score equation check: η̂^β̂ = Σ t^β̂ / r (closed form of the scale).
    const sum = [300, 600, 900].reduce((s, t) => s + t ** fit.shape, 0);
    expect(relErr(fit.scale ** fit.shape, sum)).toBeLessThan(1e-9);
  });
  it('one early failure among long-running units: the scale interval has no upper limit (null, unbounded)', () => {
    const fit = fitOf([1, ...Array<number>(10).fill(1000)], [true, ...Array<boolean>(10).fill(false)]);
    expect(fit.shape).toBeLessThan(1);
    expect(fit.scaleUpper).toBeNull();
    expect(fit.upperReason).toBe('unbounded');
    expect(fit.scaleLower).toBeGreaterThan(1000);
  });
  it('all failed at one age but another unit ran longer: a finite fit', () => {
    const fit = fitOf([500, 500, 500, 800], [true, true, true, false]);
    expect(fit.shape).toBeGreaterThan(1);
    expect(fit.shape).toBeLessThan(1e4);
  });
  it('zero lives are left out and counted; negative times and length mismatches are refused', () => {
    const withZero = fitOf([0, ...bearings], [true, ...allFailed]);
    expect(withZero.excludedZeroTimes).toBe(1);
    expect(withZero.shape).toBeCloseTo(fitOf(bearings, allFailed).shape, 12);
    expect(() => fitWeibull([-1, 5], [true, true])).toThrow(RangeError);
    expect(() => fitWeibull([1, 5], [true])).toThrow(RangeError);
  });
  it('does not depend on the time unit (days vs hours)', () => {
    const days = fitOf(bearings, allFailed);
    const hours = fitOf(
      bearings.map((t) => t * 24),
      allFailed,
    );
    expect(relErr(hours.shape, days.shape)).toBeLessThan(1e-10);
    expect(relErr(hours.scale, days.scale * 24)).toBeLessThan(1e-10);
  });
});

describe('Weibull MLE recovers planted parameters (seeded simulation)', () => {
  // Inverse-CDF draws t = η(−ln U)^{1/β}, censored by an independent uniform inspection time.
  const draw = (seed: string, n: number, shape: number, scale: number, censorMax: number) => {
    const rng = seedrandom(seed);
    const times: number[] = [];
    const events: boolean[] = [];
    for (let i = 0; i < n; i++) {
      const life = scale * (-Math.log(1 - rng())) ** (1 / shape);
      const censor = rng() * censorMax;
      times.push(Math.min(life, censor));
      events.push(life <= censor);
    }
    return { times, events };
  };

  it('finds β = 1.8, η = 1500 d inside its 90 % intervals (n = 120, about a third censored)', () => {
    const { times, events } = draw('osmia-element-life', 120, 1.8, 1500, 4000);
    const censored = events.filter((e) => !e).length;
    expect(censored).toBeGreaterThan(20);
    for (const interval of ['likelihood-ratio', 'wald-log'] as const) {
      const fit = fitOf(times, events, { confidence: 0.9, interval });
      expect(fit.shapeLower).toBeLessThan(1.8);
      expect(fit.shapeUpper!).toBeGreaterThan(1.8);
      expect(fit.scaleLower).toBeLessThan(1500);
      expect(fit.scaleUpper!).toBeGreaterThan(1500);
    }
  });

  it('covers the planted values in about 90 % of 1000 samples (n = 40, ~40 % censored)', () => {
    // One seeded stream for all samples. Binomial sd at 0.9: √(0.09/1000) = 0.0095; the bounds allow
    // ±3 sd (likelihood-ratio intervals run a little under nominal at n = 40).
    const rng = seedrandom('osmia-coverage');
    let shapeHits = 0;
    let scaleHits = 0;
    const runs = 1000;
    for (let k = 0; k < runs; k++) {
      const times: number[] = [];
      const events: boolean[] = [];
      for (let i = 0; i < 40; i++) {
        const life = 900 * (-Math.log(1 - rng())) ** (1 / 2.5);
        const censor = rng() * 2000;
        times.push(Math.min(life, censor));
        events.push(life <= censor);
      }
      const fit = fitOf(times, events, { confidence: 0.9 });
      if (fit.shapeLower <= 2.5 && 2.5 <= fit.shapeUpper!) shapeHits += 1;
      if (fit.scaleLower <= 900 && 900 <= fit.scaleUpper!) scaleHits += 1;
    }
    for (const hits of [shapeHits, scaleHits]) {
      expect(hits / runs).toBeGreaterThan(0.87);
      expect(hits / runs).toBeLessThan(0.93);
    }
  });
});

// Freireich et al. (1963) 6-MP arm, n = 21 (data read, as tabulated by Gehan 1965); expected values:
// project reference checks, id km.freireich_6mp (own product-limit code matching the R survfit printout).
const remission = {
  time: [6, 6, 6, 6, 7, 9, 10, 10, 11, 13, 16, 17, 19, 20, 22, 23, 25, 32, 32, 34, 35],
  event: [1, 1, 1, 0, 1, 0, 1, 0, 0, 1, 1, 0, 0, 0, 1, 1, 0, 0, 0, 0, 0].map((e) => e === 1),
};
const kmExpected = [
  { t: 6, nRisk: 21, nEvents: 3, survival: 0.8571428571, se: 0.07636035483, lower: 0.7198170839, upper: 1.0 },
  { t: 7, nRisk: 17, nEvents: 1, survival: 0.8067226891, se: 0.08693528518, lower: 0.6531242185, upper: 0.9964436759 },
  { t: 10, nRisk: 15, nEvents: 1, survival: 0.7529411765, se: 0.09634965299, lower: 0.585918982, upper: 0.9675747546 },
  { t: 13, nRisk: 12, nEvents: 1, survival: 0.6901960784, se: 0.1068147078, lower: 0.5096130991, upper: 0.9347691955 },
  { t: 16, nRisk: 11, nEvents: 1, survival: 0.6274509804, se: 0.1140538653, lower: 0.439393925, upper: 0.8959949385 },
  { t: 22, nRisk: 7, nEvents: 1, survival: 0.5378151261, se: 0.1282337517, lower: 0.3370366162, upper: 0.858200848 },
  { t: 23, nRisk: 6, nEvents: 1, survival: 0.4481792717, se: 0.1345914568, lower: 0.2487882268, upper: 0.8073720455 },
];
// R survival::survfit printout of this arm, as published (read), 3–4 digits.
const kmPublished = {
  survival: [0.857, 0.807, 0.753, 0.69, 0.627, 0.538, 0.448],
  se: [0.0764, 0.0869, 0.0963, 0.1068, 0.1141, 0.1282, 0.1346],
  lower: [0.72, 0.653, 0.586, 0.51, 0.439, 0.337, 0.249],
  upper: [1.0, 0.996, 0.968, 0.935, 0.896, 0.858, 0.807],
};

describe('Kaplan–Meier, 6-MP arm, 95 % log-transformed bounds', () => {
  const km = kaplanMeier(remission.time, remission.event, 0.95);
  const eventRows = km.rows.filter((r) => r.nEvents > 0);

  it('has one row per distinct time and the event rows of the R printout', () => {
    expect(km.rows.map((r) => r.t)).toEqual([6, 7, 9, 10, 11, 13, 16, 17, 19, 20, 22, 23, 25, 32, 34, 35]);
    expect(eventRows.map((r) => r.t)).toEqual(kmExpected.map((r) => r.t));
    expect(km.n).toBe(21);
    expect(km.events).toBe(9);
  });

  it.each(kmExpected.map((row, i) => [row.t, i] as const))(
    't = %s wk: n at risk, S, Greenwood SE, CI (abs 1e-6)',
    (_t, i) => {
      const row = eventRows[i]!;
      const want = kmExpected[i]!;
      expect(row.nRisk).toBe(want.nRisk);
      expect(row.nEvents).toBe(want.nEvents);
      expect(Math.abs(row.survival - want.survival)).toBeLessThan(1e-6);
      expect(Math.abs(row.se! - want.se)).toBeLessThan(1e-6);
      expect(Math.abs(row.lower! - want.lower)).toBeLessThan(1e-6);
      expect(Math.abs(row.upper! - want.upper)).toBeLessThan(1e-6);
      // Published printout digits (abs 5e-4).
      expect(Math.abs(row.survival - kmPublished.survival[i]!)).toBeLessThanOrEqual(5e-4);
      expect(Math.abs(row.se! - kmPublished.se[i]!)).toBeLessThanOrEqual(5e-4);
      expect(Math.abs(row.lower! - kmPublished.lower[i]!)).toBeLessThanOrEqual(5e-4);
      expect(Math.abs(row.upper! - kmPublished.upper[i]!)).toBeLessThanOrEqual(5e-4);
    },
  );

  it('counts a censoring tied with an event as still at risk (t = 6: 21 at risk, 3 events, 1 censored)', () => {
    expect(km.rows[0]).toMatchObject({ t: 6, nRisk: 21, nEvents: 3, nCensored: 1 });
    expect(km.rows[1]).toMatchObject({ t: 7, nRisk: 17 });
  });

  it('median 23 wk with R-style 95 % limits (16, none); RMST to 35 wk 23.28739496 (abs 1e-6)', () => {
    expect(km.median).toBe(23);
    expect(km.medianLower).toBe(16);
    expect(km.medianUpper).toBeNull();
    expect(Math.abs(kmRestrictedMean(km, 35) - 23.28739496)).toBeLessThan(1e-6);
  });

  it('narrows at 90 % confidence (the default level elsewhere)', () => {
    const km90 = kaplanMeier(remission.time, remission.event, 0.9);
    const at23 = km90.rows.find((r) => r.t === 23)!;
    expect(at23.lower!).toBeGreaterThan(0.2487882268);
    expect(at23.upper!).toBeLessThan(0.8073720455);
    expect(at23.survival).toBeCloseTo(0.4481792717, 9);
  });
});

describe('Kaplan–Meier degenerate input', () => {
  it('empty window: no rows, median null (no-data)', () => {
    expect(kaplanMeier([], [], 0.9)).toMatchObject({ rows: [], median: null, reason: 'no-data', n: 0, events: 0 });
  });
  it('all censored: survival 1 everywhere with zero-width bounds, median not reached', () => {
    const km = kaplanMeier([100, 200, 200, 300], [false, false, false, false], 0.9);
    expect(km.rows.map((r) => r.survival)).toEqual([1, 1, 1]);
    expect(km.rows.every((r) => r.se === 0 && r.lower === 1 && r.upper === 1)).toBe(true);
    expect(km).toMatchObject({ median: null, reason: 'not-reached' });
  });
  it('one failure among four: S = 3/4 after it, Greenwood SE √(3/64) (hand-worked)', () => {
    const km = kaplanMeier([10, 20, 30, 40], [false, true, false, false], 0.9);
    const row = km.rows.find((r) => r.nEvents === 1)!;
    expect(row.nRisk).toBe(3);
    expect(row.survival).toBeCloseTo(2 / 3, 15);
    // S = 1 − 1/3; SE = S·√(1/(3·2)).
    expect(row.se!).toBeCloseTo((2 / 3) * Math.sqrt(1 / 6), 15);
  });
  it('survival reaching 0: the last row has no SE or bounds; the median uses the midpoint rule', () => {
    // 1, 2, 3, 4 all failed: S = 0.75, 0.5, 0.25, 0. S is exactly 0.5 on [2, 3), so the median
    // is 2.5, as R survfit prints it (from memory).
    const km = kaplanMeier([1, 2, 3, 4], [true, true, true, true], 0.9);
    expect(km.rows.map((r) => r.survival)).toEqual([0.75, 0.5, 0.25, 0]);
    expect(km.rows[3]).toMatchObject({ se: null, lower: null, upper: null });
    expect(km.median).toBe(2.5);
  });
  it('zero times are kept (an element that failed at installation)', () => {
    const km = kaplanMeier([0, 5, 9], [true, false, true], 0.9);
    expect(km.rows[0]).toMatchObject({ t: 0, nRisk: 3, nEvents: 1 });
    expect(km.rows[0]!.survival).toBeCloseTo(2 / 3, 15);
  });
  it('refuses bad input', () => {
    expect(() => kaplanMeier([1, 2], [true], 0.9)).toThrow(RangeError);
    expect(() => kaplanMeier([-1], [true], 0.9)).toThrow(RangeError);
    expect(() => kaplanMeier([1], [true], 1)).toThrow(RangeError);
  });
});

// ---------------------------------------------------------------------------------------------
// Delayed entry (left truncation): lives first seen at an age e > 0. Risk sets and likelihood as in
// Klein & Moeschberger, Survival Analysis, 2nd ed., ch. 4 (truncation): at risk at t when e < t ≤ time;
// log L = Σ_events ln f(t) + Σ_censored ln S(t) − Σ_all ln S(e).

describe('Kaplan–Meier with delayed entry (hand-worked)', () => {
  // Six lives (entry age, exit age, event?). The risk set at t holds the lives with entry < t ≤ exit
  // (entry 0: at risk from the start); a life entering at 4 is not at risk at 4.
  //   L1 (0, 3] E   L2 (0, 5] C   L3 (2, 4] E   L4 (4, 7] E   L5 (1, 6] E   L6 (5, 8] C
  //
  //   t | at risk            | n | d | c | S(t)                     | Σ d/(n(n−d))
  //   3 | L1 L2 L3 L5        | 4 | 1 | 0 | 3/4        = 0.75        | 1/12
  //   4 | L2 L3 L5 (not L4)  | 3 | 1 | 0 | 0.75 · 2/3 = 0.5         | 1/12 + 1/6 = 1/4
  //   5 | L2 L4 L5 (not L6)  | 3 | 0 | 1 | 0.5                      | 1/4
  //   6 | L4 L5 L6           | 3 | 1 | 0 | 0.5 · 2/3  = 1/3         | 1/4 + 1/6 = 5/12
  //   7 | L4 L6              | 2 | 1 | 0 | 1/3 · 1/2  = 1/6         | 5/12 + 1/2 = 11/12
  //   8 | L6                 | 1 | 0 | 1 | 1/6                      | 11/12
  // Median: S = 0.5 exactly from 4 until the drop at 6 → midpoint 5 (the survfit rule used above).
  const times = [3, 5, 4, 7, 6, 8];
  const events = [true, false, true, true, true, false];
  const entries = [0, 0, 2, 4, 1, 5];
  const km = kaplanMeier(times, events, 0.9, entries);

  it('counts at risk only the lives that have entered (hand-worked table)', () => {
    expect(km.rows.map((r) => [r.t, r.nRisk, r.nEvents, r.nCensored])).toEqual([
      [3, 4, 1, 0],
      [4, 3, 1, 0],
      [5, 3, 0, 1],
      [6, 3, 1, 0],
      [7, 2, 1, 0],
      [8, 1, 0, 1],
    ]);
    expect(km.rows.map((r) => r.survival)).toEqual([0.75, 0.5, 0.5, 1 / 3, 1 / 6, 1 / 6].map((s) => expect.closeTo(s, 12)));
    expect([km.n, km.events]).toEqual([6, 4]);
  });

  it('keeps Greenwood’s form on those risk sets (hand-worked)', () => {
    expect(km.rows[1]!.se).toBeCloseTo(0.5 * Math.sqrt(1 / 4), 12);
    expect(km.rows[4]!.se).toBeCloseTo((1 / 6) * Math.sqrt(11 / 12), 12);
    const z = 1.6448536269514722; // z_0.95, normal table
    expect(km.rows[4]!.lower).toBeCloseTo((1 / 6) * Math.exp(-z * Math.sqrt(11 / 12)), 12);
    expect(km.median).toBeCloseTo(5, 12);
  });

  it('differs from ignoring the entries (all six at risk at 3: S = 5/6)', () => {
    const plain = kaplanMeier(times, events, 0.9);
    expect(plain.rows[0]).toMatchObject({ t: 3, nRisk: 6 });
    expect(plain.rows[0]!.survival).toBeCloseTo(5 / 6, 12);
  });

  it('with every entry 0 gives exactly the plain estimate', () => {
    expect(kaplanMeier(remission.time, remission.event, 0.95, remission.time.map(() => 0))).toEqual(
      kaplanMeier(remission.time, remission.event, 0.95),
    );
  });

  it('with entries below the first event time gives the plain estimate after it (hand-worked: nothing is at risk-excluded then)', () => {
    const shifted = kaplanMeier(remission.time, remission.event, 0.95, remission.time.map((_, i) => (i % 3) * 1.5));
    const plain = kaplanMeier(remission.time, remission.event, 0.95);
    expect(shifted.rows.map((r) => [r.nRisk, r.survival])).toEqual(plain.rows.map((r) => [r.nRisk, r.survival]));
  });

  it('refuses an entry age that is negative, not below its time, or a length mismatch', () => {
    expect(() => kaplanMeier([5], [true], 0.9, [-1])).toThrow(RangeError);
    expect(() => kaplanMeier([5], [true], 0.9, [5])).toThrow(RangeError);
    expect(() => kaplanMeier([5], [true], 0.9, [6])).toThrow(RangeError);
    expect(() => kaplanMeier([5, 6], [true, true], 0.9, [1])).toThrow(RangeError);
    expect(() => kaplanMeier([0], [true], 0.9, [0])).not.toThrow();
  });
});

/**
 * The left-truncated, right-censored Weibull log-likelihood written out from the formula, independent
 * of the production code: Σ_events [ln β − ln η + (β − 1) ln(t/η)] − Σ_all (t/η)^β + Σ_all (e/η)^β.
 */
function truncatedLogLik(times: readonly number[], events: readonly boolean[], entries: readonly number[], shape: number, scale: number): number {
  let sum = 0;
  times.forEach((t, i) => {
    if (events[i]) sum += Math.log(shape) - Math.log(scale) + (shape - 1) * Math.log(t / scale);
    sum -= (t / scale) ** shape;
    sum += (entries[i]! / scale) ** shape;
  });
  return sum;
}

/** Plain Nelder–Mead simplex (reflection 1, expansion 2, contraction ½, shrink ½), minimizing f. */
function nelderMead(f: (x: readonly number[]) => number, start: readonly number[], step: number): number[] {
  const dim = start.length;
  let simplex = [start.slice(), ...start.map((_, j) => start.map((x, k) => (k === j ? x + step : x)))];
  let values = simplex.map(f);
  for (let iter = 0; iter < 5000; iter++) {
    const order = values.map((v, i) => i).sort((a, b) => values[a]! - values[b]!);
    simplex = order.map((i) => simplex[i]!);
    values = order.map((i) => values[i]!);
    if (Math.abs(values[dim]! - values[0]!) < 1e-14 && Math.abs(simplex[dim]![0]! - simplex[0]![0]!) < 1e-11) break;
    const centroid = start.map((_, k) => simplex.slice(0, dim).reduce((s, p) => s + p[k]!, 0) / dim);
    const along = (t: number) => centroid.map((c, k) => c + t * (simplex[dim]![k]! - c));
    const reflected = along(-1);
    const fr = f(reflected);
    if (fr < values[0]!) {
      const expanded = along(-2);
      const fe = f(expanded);
      [simplex[dim], values[dim]] = fe < fr ? [expanded, fe] : [reflected, fr];
    } else if (fr < values[dim - 1]!) {
      [simplex[dim], values[dim]] = [reflected, fr];
    } else {
      const contracted = fr < values[dim]! ? along(-0.5) : along(0.5);
      const fc = f(contracted);
      if (fc < Math.min(fr, values[dim]!)) [simplex[dim], values[dim]] = [contracted, fc];
      else {
        simplex = simplex.map((p) => p.map((x, k) => simplex[0]![k]! + 0.5 * (x - simplex[0]![k]!)));
        values = simplex.map(f);
      }
    }
  }
  return simplex[0]!;
}

describe('Weibull MLE with delayed entry (left truncation)', () => {
  // Invented element lives in days: (entry age, exit age, event?). Six seen from installation, eight
  // already in service when observation began.
  const lives: Array<[number, number, boolean]> = [
    [0, 120, true],
    [0, 200, false],
    [0, 310, true],
    [0, 150, true],
    [0, 400, false],
    [50, 260, true],
    [80, 330, true],
    [120, 450, false],
    [200, 380, true],
    [30, 90, true],
    [150, 500, false],
    [250, 420, true],
    [10, 180, true],
    [300, 520, false],
  ];
  const entries = lives.map((l) => l[0]);
  const times = lives.map((l) => l[1]);
  const events = lives.map((l) => l[2]);
  const fit = fitOf(times, events, { entries, confidence: 0.9 });
  const negLogLik = ([a, b]: readonly number[]) => -truncatedLogLik(times, events, entries, Math.exp(a!), Math.exp(b!));

  it('maximizes the truncated likelihood: agrees with a Nelder–Mead search of the formula (rel 1e-6)', () => {
    // Independent method: the likelihood written out above, maximized by a plain simplex search in
    // (ln β, ln η) from a start far off (β = 1, η = 100).
    const [a, b] = nelderMead(negLogLik, [0, Math.log(100)], 0.5);
    expect(relErr(fit.shape, Math.exp(a!))).toBeLessThan(1e-6);
    expect(relErr(fit.scale, Math.exp(b!))).toBeLessThan(1e-6);
    expect(fit.logLik).toBeCloseTo(truncatedLogLik(times, events, entries, fit.shape, fit.scale), 9);
    expect([fit.n, fit.events]).toEqual([14, 9]);
  });

  it('closed-form scale at the MLE: η = ((Σ t^β − Σ e^β)/r)^{1/β}', () => {
    const b = fit.shape;
    const net = times.reduce((s, t) => s + t ** b, 0) - entries.reduce((s, e) => s + e ** b, 0);
    expect(relErr(fit.scale, (net / 9) ** (1 / b))).toBeLessThan(1e-12);
  });

  it('differs from the fit that ignores the entries (which counts survival to entry as observed)', () => {
    const naive = fitOf(times, events);
    expect(relErr(naive.shape, fit.shape)).toBeGreaterThan(0.05);
    expect(naive.scale).toBeGreaterThan(fit.scale);
  });

  it('has likelihood-ratio limits where an independent profile deviance equals χ²₀.₉(1) = z₀.₉₅²', () => {
    // χ²(1) at 0.9 is z_0.95² = 1.6448536269514722² = 2.70554 (normal and chi-square tables).
    const q = 1.6448536269514722 ** 2;
    const best = -negLogLik([Math.log(fit.shape), Math.log(fit.scale)]);
    // Profile over η at fixed β, and over β at fixed η, each by a one-dimensional simplex search.
    const profileShape = (shape: number) => -negLogLik([Math.log(shape), nelderMead(([b]) => negLogLik([Math.log(shape), b!]), [Math.log(fit.scale)], 0.2)[0]!]);
    const profileScale = (scale: number) => -negLogLik([nelderMead(([a]) => negLogLik([a!, Math.log(scale)]), [Math.log(fit.shape)], 0.2)[0]!, Math.log(scale)]);
    for (const [limit, profile] of [
      [fit.shapeLower, profileShape],
      [fit.shapeUpper!, profileShape],
      [fit.scaleLower, profileScale],
      [fit.scaleUpper!, profileScale],
    ] as const) {
      expect(2 * (best - profile(limit))).toBeCloseTo(q, 5);
    }
    expect(fit.shapeLower).toBeLessThan(fit.shape);
    expect(fit.scaleUpper!).toBeGreaterThan(fit.scale);
  });

  it('has a confidence region on the truncated likelihood’s χ² contour', () => {
    const region = weibullConfidenceRegion(times, events, { entries, confidence: 0.9, dof: 2, points: 24 });
    // χ²(2) at 0.9 is −2 ln 0.1 = 4.60517 (closed form for 2 degrees of freedom).
    const q2 = -2 * Math.log(0.1);
    expect(region).toHaveLength(24);
    for (const p of region) {
      expect(p.closed).toBe(true);
      expect(2 * (fit.logLik - truncatedLogLik(times, events, entries, p.shape, p.scale))).toBeCloseTo(q2, 6);
    }
  });

  it('with every entry 0 gives exactly the plain fit', () => {
    expect(fitOf(times, events, { entries: times.map(() => 0) })).toEqual(fitOf(times, events));
    expect(fitOf(bearings, allFailed, { entries: bearings.map(() => 0) })).toEqual(fitOf(bearings, allFailed));
  });

  it('covers planted β = 2, η = 1500 d in about 90 % of 400 windows of a simulated plant (seeded); ignoring entry biases β', () => {
    // Each sample: 100 positions, each renewed on failure (lives Weibull(2, 1500) by inverse CDF)
    // from a staggered start, observed over the window [6000, 8000) days; lives running at 6000
    // enter at their age then, lives running at 8000 are censored there. Binomial sd at 0.9 over 400
    // samples: √(0.09/400) = 0.015; the bounds allow about ±2.7 sd.
    const rng = seedrandom('osmia-left-truncation');
    const runs = 400;
    let shapeHits = 0;
    let scaleHits = 0;
    let shapeSum = 0;
    let naiveShapeSum = 0;
    for (let k = 0; k < runs; k++) {
      const obs = { times: [] as number[], events: [] as boolean[], entries: [] as number[] };
      for (let p = 0; p < 100; p++) {
        let installed = -rng() * 3000;
        while (installed < 8000) {
          const removed = installed + 1500 * (-Math.log(1 - rng())) ** (1 / 2);
          if (removed > 6000) {
            obs.times.push(Math.min(removed, 8000) - installed);
            obs.events.push(removed < 8000);
            obs.entries.push(installed < 6000 ? 6000 - installed : 0);
          }
          installed = removed;
        }
      }
      const w = fitOf(obs.times, obs.events, { entries: obs.entries, confidence: 0.9 });
      if (w.shapeLower <= 2 && 2 <= w.shapeUpper!) shapeHits += 1;
      if (w.scaleLower <= 1500 && 1500 <= w.scaleUpper!) scaleHits += 1;
      shapeSum += w.shape;
      naiveShapeSum += fitOf(obs.times, obs.events, { interval: 'wald-log' }).shape;
    }
    for (const hits of [shapeHits, scaleHits]) {
      expect(hits / runs).toBeGreaterThan(0.86);
      expect(hits / runs).toBeLessThan(0.94);
    }
    // Mean of the estimates: the truncated fit near the planted 2 (MLE small-sample bias is a few
    // per cent at ~40 events), the fit that starts every life at 0 well above it.
    expect(Math.abs(shapeSum / runs - 2)).toBeLessThan(0.05);
    expect(naiveShapeSum / runs).toBeGreaterThan(2.1);
  });

  it('every life entered late, the one event young, long exposure at old ages with none: no finite fit', () => {
    // Lives (1, 1.01] failed and (100, 10000] censored: the hazard looks ever more decreasing, the
    // likelihood keeps rising as β → 0 (own reasoning from the formula; its values checked here), so
    // the fit is null ('shape-diverges') rather than an arbitrary small β.
    const t = [1.01, 10000];
    const e = [1, 100];
    const ev = [true, false];
    const result = fitWeibull(t, ev, { entries: e });
    expect(result.fit).toBeNull();
    expect(result.reason).toBe('shape-diverges');
    // Profile log-likelihood at fixed β: maximized over ln η by the simplex search above.
    const profile = (shape: number) => {
      const [lnScale] = nelderMead(([b]) => -truncatedLogLik(t, ev, e, shape, Math.exp(b!)), [0], 1);
      return truncatedLogLik(t, ev, e, shape, Math.exp(lnScale!));
    };
    expect(profile(0.01)).toBeGreaterThan(profile(0.1));
    expect(profile(0.1)).toBeGreaterThan(profile(1));
  });
});
