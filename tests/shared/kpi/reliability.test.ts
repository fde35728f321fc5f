import { describe, expect, it } from 'vitest';

import {
  inherentAvailability,
  meanActiveRepairHours,
  mtbfWithBounds,
  mttrHours,
  operationalAvailability,
  type MtbfInput,
} from '#shared/kpi/reliability.ts';

const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

// Source of the 800 h / 2 failures cases: NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1
// (formulas read; the example and its factors 0.3177 / 5.6281 from memory). Numbers: project
// reference checks, id mtbf.chi2.nist_8451_example (scipy chi2.ppf), tolerance rel 1e-5.
describe('MTBF chi-square bounds, T = 800 h, r = 2', () => {
  const cases: Array<{
    name: string;
    input: Omit<MtbfInput, 'operatingHours' | 'failures'>;
    lower: number;
    upper: number | null;
  }> = [
    {
      name: 'time-terminated, 90 % two-sided',
      input: { confidence: 0.9, terminated: 'time' },
      lower: 127.0689683,
      upper: 2251.228611,
    },
    {
      name: 'time-terminated, 80 % two-sided',
      input: { confidence: 0.8, terminated: 'time' },
      lower: 150.3103814,
      upper: 1504.292098,
    },
    {
      name: 'time-terminated, 95 % one-sided lower (= the 90 % two-sided lower bound)',
      input: { confidence: 0.95, terminated: 'time', sides: 'one-sided-lower' },
      lower: 127.0689683,
      upper: null,
    },
    {
      name: 'failure-terminated, 90 % two-sided',
      input: { confidence: 0.9, terminated: 'failure' },
      lower: 168.6388802,
      upper: 2251.228611,
    },
  ];
  it.each(cases)('$name', ({ input, lower, upper }) => {
    const result = mtbfWithBounds({ operatingHours: 800, failures: 2, ...input });
    expect(result.mtbfHours).toBe(400);
    expect(relErr(result.lowerHours!, lower)).toBeLessThan(1e-5);
    if (upper === null) expect(result.upperHours).toBeNull();
    else expect(relErr(result.upperHours!, upper)).toBeLessThan(1e-5);
    expect(result.reason).toBeUndefined();
  });

  it('gives the handbook factors 0.3177 and 5.6281 of the point estimate at 90 % (from memory, 4 decimals)', () => {
    const result = mtbfWithBounds({ operatingHours: 800, failures: 2, confidence: 0.9, terminated: 'time' });
    // Reference checks: factors 0.3176724207 and 5.628071527 (rel 1e-5).
    expect(relErr(result.lowerHours! / 400, 0.3176724207)).toBeLessThan(1e-5);
    expect(relErr(result.upperHours! / 400, 5.628071527)).toBeLessThan(1e-5);
    expect(Math.abs(result.lowerHours! / 400 - 0.3177)).toBeLessThan(5e-5);
    expect(Math.abs(result.upperHours! / 400 - 5.6281)).toBeLessThan(5e-5);
  });

  it('widens as the confidence rises', () => {
    const at = (confidence: number) =>
      mtbfWithBounds({ operatingHours: 800, failures: 2, confidence, terminated: 'time' });
    expect(at(0.95).lowerHours!).toBeLessThan(at(0.9).lowerHours!);
    expect(at(0.95).upperHours!).toBeGreaterThan(at(0.9).upperHours!);
  });
});

describe('MTBF with zero failures (T = 800 h)', () => {
  // NIST §8.4.5.1 zero-failure lower bound T/(−ln α) at confidence 1 − α (formula read);
  // values: reference checks, rel 1e-5.
  it.each([
    [0.9, 347.4355855],
    [0.6, 873.0853343],
  ])('one-sided %s lower bound is %s h = T/(−ln α); no point estimate, no upper bound', (confidence, lower) => {
    const result = mtbfWithBounds({
      operatingHours: 800,
      failures: 0,
      confidence,
      terminated: 'time',
      sides: 'one-sided-lower',
    });
    expect(relErr(result.lowerHours!, lower)).toBeLessThan(1e-5);
    expect(relErr(result.lowerHours!, 800 / -Math.log(1 - confidence))).toBeLessThan(1e-9);
    expect(result).toMatchObject({ mtbfHours: null, upperHours: null, reason: 'no-failures' });
  });

  it('two-sided (the default) gives docs/design.md §6 lower 2T/χ²_{1−α/2}(2) = T/(−ln(α/2)) = 267.0466 h at 90 %', () => {
    // Own computation from the closed form: 800 / ln 20 = 267.04656...
    const result = mtbfWithBounds({ operatingHours: 800, failures: 0, confidence: 0.9, terminated: 'time' });
    expect(relErr(result.lowerHours!, 800 / Math.log(20))).toBeLessThan(1e-9);
    expect(Math.abs(result.lowerHours! - 267.0466)).toBeLessThan(1e-4);
    expect(result).toMatchObject({ mtbfHours: null, upperHours: null, reason: 'no-failures', sides: 'two-sided' });
  });

  it('refuses a failure-terminated record without failures', () => {
    expect(() => mtbfWithBounds({ operatingHours: 800, failures: 0, confidence: 0.9, terminated: 'failure' })).toThrow(
      /failures must be ≥ 1/,
    );
  });
});

describe('MTBF degenerate and bad input', () => {
  it('one failure: point T, both bounds (own computation: 2T/χ²_0.95(4), 2T/χ²_0.05(2))', () => {
    // χ²_0.95(4) = 9.487729, χ²_0.05(2) = −2 ln 0.95 = 0.1025866 (table value and closed form).
    const result = mtbfWithBounds({ operatingHours: 100, failures: 1, confidence: 0.9, terminated: 'time' });
    expect(result.mtbfHours).toBe(100);
    expect(relErr(result.lowerHours!, 200 / 9.487729037)).toBeLessThan(1e-6);
    expect(relErr(result.upperHours!, 200 / (-2 * Math.log(0.95)))).toBeLessThan(1e-9);
  });

  it('no operating time: everything null with a reason', () => {
    expect(mtbfWithBounds({ operatingHours: 0, failures: 3, confidence: 0.9, terminated: 'time' })).toMatchObject({
      mtbfHours: null,
      lowerHours: null,
      upperHours: null,
      reason: 'no-operating-time',
    });
  });

  it.each([
    [{ operatingHours: -1, failures: 1 }],
    [{ operatingHours: Number.NaN, failures: 1 }],
    [{ operatingHours: 100, failures: 1.5 }],
    [{ operatingHours: 100, failures: -1 }],
  ])('refuses %o', (bad) => {
    expect(() => mtbfWithBounds({ ...bad, confidence: 0.9, terminated: 'time' })).toThrow(RangeError);
  });

  it.each([0, 1, 1.2])('refuses confidence %s', (confidence) => {
    expect(() => mtbfWithBounds({ operatingHours: 100, failures: 1, confidence, terminated: 'time' })).toThrow(
      RangeError,
    );
  });
});

// Reference check availability.inherent (invented plant, own computation; formula from memory,
// textbook identity A = MTBF/(MTBF + MTTR)).
describe('availability', () => {
  it('A_i = 1000/(1000 + 10) = 0.9900990099 (rel 1e-9)', () => {
    expect(relErr(inherentAvailability(1000, 10).value!, 0.9900990099)).toBeLessThan(1e-9);
  });

  describe('plant example: 8760 h window, repairs 10 + 14 + 6 + 18 h, two 8 h cleanings', () => {
    const windowHours = 8760;
    const repairs = [10, 14, 6, 18];
    const cleanings = [8, 8];
    const downtime = [...repairs, ...cleanings].reduce((a, b) => a + b, 0);
    const operatingHours = windowHours - downtime; // 8696 h
    const mtbf = mtbfWithBounds({ operatingHours, failures: repairs.length, confidence: 0.9, terminated: 'time' });
    const mttr = mttrHours(repairs);

    it('operating time 8696 h, MTBF 2174 h, MTTR 12 h (rel 1e-9)', () => {
      expect(operatingHours).toBe(8696);
      expect(relErr(mtbf.mtbfHours!, 2174)).toBeLessThan(1e-9);
      expect(relErr(mttr.value!, 12)).toBeLessThan(1e-9);
    });
    it('inherent availability 0.9945105215 (rel 1e-9)', () => {
      expect(relErr(inherentAvailability(mtbf.mtbfHours, mttr).value!, 0.9945105215)).toBeLessThan(1e-9);
    });
    it('operational availability 0.9926940639 (rel 1e-9): cleanings count as down time', () => {
      expect(relErr(operationalAvailability(operatingHours, downtime).value!, 0.9926940639)).toBeLessThan(1e-9);
    });
    it('MTBF 90 % two-sided time-terminated bounds (950.0171436, 6364.548718) (rel 1e-5)', () => {
      expect(relErr(mtbf.lowerHours!, 950.0171436)).toBeLessThan(1e-5);
      expect(relErr(mtbf.upperHours!, 6364.548718)).toBeLessThan(1e-5);
    });
  });

  it('is null with the MTBF reason when there are no failures', () => {
    const mtbf = mtbfWithBounds({ operatingHours: 500, failures: 0, confidence: 0.9, terminated: 'time' });
    expect(inherentAvailability(mtbf.mtbfHours, mttrHours([]))).toEqual({ value: null, reason: 'no-failures' });
    expect(inherentAvailability({ value: null, reason: 'no-operating-time' }, 3)).toEqual({
      value: null,
      reason: 'no-operating-time',
    });
  });

  it('is null (no-time) when both terms are zero, and 1 with no down time', () => {
    expect(operationalAvailability(0, 0)).toEqual({ value: null, reason: 'no-time' });
    expect(inherentAvailability(0, 0)).toEqual({ value: null, reason: 'no-time' });
    expect(operationalAvailability(100, 0)).toEqual({ value: 1 });
    expect(operationalAvailability(0, 5)).toEqual({ value: 0 });
  });

  it('refuses negative hours', () => {
    expect(() => operationalAvailability(-1, 2)).toThrow(RangeError);
    expect(() => inherentAvailability(100, -2)).toThrow(RangeError);
  });
});

describe('MTTR and mean active repair time', () => {
  it('MTTR is the mean out-of-service time per failure; zero durations count', () => {
    expect(mttrHours([10, 14, 6, 18]).value).toBe(12);
    expect(mttrHours([0, 4]).value).toBe(2);
    expect(mttrHours([])).toEqual({ value: null, reason: 'no-failures' });
    expect(() => mttrHours([3, -1])).toThrow(RangeError);
  });

  it('mean active repair time is real elapsed time across a daylight-saving change', () => {
    // Europe/Berlin, 31 March 2024: 01:00+01:00 to 04:00+02:00 is 2 h of real time (hand-worked).
    const jobs = [
      { startedAt: new Date('2024-03-31T01:00:00+01:00'), completedAt: new Date('2024-03-31T04:00:00+02:00') },
      { startedAt: new Date('2024-04-02T08:00:00Z'), completedAt: new Date('2024-04-02T12:00:00Z') },
    ];
    expect(meanActiveRepairHours(jobs).value).toBe(3);
  });

  it('is null without jobs; a zero-length job counts as 0 h; a job ending before it starts is refused', () => {
    expect(meanActiveRepairHours([])).toEqual({ value: null, reason: 'no-repairs' });
    const t = new Date('2024-01-01T00:00:00Z');
    expect(meanActiveRepairHours([{ startedAt: t, completedAt: t }]).value).toBe(0);
    expect(() => meanActiveRepairHours([{ startedAt: t, completedAt: new Date('2023-12-31T23:00:00Z') }])).toThrow(
      RangeError,
    );
    expect(() => meanActiveRepairHours([{ startedAt: new Date('x'), completedAt: t }])).toThrow(RangeError);
  });
});
