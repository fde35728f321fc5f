import { describe, expect, it } from 'vitest';

import { timeToComplete, type JobStepRow } from '#shared/kpi/time-to-complete.ts';

const HOUR = 3_600_000;
const at = (iso: string) => new Date(iso);

// Job durations of the reference check quantile.definitions (invented data, hours).
const durations = [4.5, 12.0, 2.5, 30.0, 6.0, 3.0, 16.0, 7.5, 4.0, 8.0];
const crews = ['A', 'B', 'A', 'B', 'A', 'B', 'A', 'B', 'A', 'B'];
const guided = [true, false, true, false, true, false, false, true, true, false];

/** Two steps per job with a half-hour pause between them; listed last step first on purpose. */
function stepsFor(): JobStepRow[] {
  return durations.flatMap((hours, i) => {
    const start = Date.UTC(2025, 0, 6 + i * 10, 7); // one job every ten days
    const woNumber = `WO-${100 + i}`;
    return [
      {
        woNumber,
        step: 2,
        startedAt: new Date(start + 1.5 * HOUR),
        completedAt: new Date(start + hours * HOUR),
        guided: false,
        technician: 'T2',
      },
      {
        woNumber,
        step: 1,
        startedAt: new Date(start),
        completedAt: new Date(start + HOUR),
        guided: guided[i]!,
        technician: 'T1',
      },
    ];
  });
}
const jobInfo = durations.map((_, i) => ({
  woNumber: `WO-${100 + i}`,
  crew: crews[i]!,
  procedure: i < 5 ? 'vessel-reload' : 'pump-seal',
}));

describe('time to complete', () => {
  const result = timeToComplete({ steps: stepsFor(), jobInfo });
  const group = (key: string) => result.groups.find((g) => g.key === key)!;

  it('states its quantile method', () => {
    expect(result.quantileMethod).toBe('type7 (Hyndman & Fan 1996; R default)');
  });

  it('runs a job from its first step start to its last step end, pauses included', () => {
    expect(result.jobs).toHaveLength(10);
    const first = result.jobs[0]!;
    expect(first).toMatchObject({ woNumber: 'WO-100', hours: 4.5, steps: 2, crew: 'A', procedure: 'vessel-reload' });
    expect(first.startedAt.toISOString()).toBe('2025-01-06T07:00:00.000Z');
    expect(first.completedAt.toISOString()).toBe('2025-01-06T11:30:00.000Z');
    expect(result.jobs.map((j) => j.hours)).toEqual(durations);
  });

  it('counts a job as guided when any step was guided', () => {
    expect(result.jobs.map((j) => j.guided)).toEqual(guided);
  });

  it('group all: n 10, mean 9.35, median 6.75, p90 17.4 (type 7), sd 8.389974176 (reference checks, abs 1e-9)', () => {
    const all = group('all');
    expect(all.n).toBe(10);
    expect(Math.abs(all.meanHours! - 9.35)).toBeLessThan(1e-9);
    expect(Math.abs(all.medianHours! - 6.75)).toBeLessThan(1e-9);
    expect(Math.abs(all.p90Hours! - 17.4)).toBeLessThan(1e-9);
    expect(Math.abs(all.sdHours! - 8.389974176)).toBeLessThan(1e-9);
    expect(all).toMatchObject({ minHours: 2.5, maxHours: 30 });
  });

  it('splits guided and unguided jobs (hand-worked)', () => {
    // guided: 4.5, 2.5, 6.0, 7.5, 4.0 → sorted 2.5, 4, 4.5, 6, 7.5: median 4.5, mean 4.9,
    // p90 = 6 + 0.6·1.5 = 6.9. Unguided: 12, 30, 3, 16, 8 → median 12, mean 13.8, p90 = 16 + 0.6·14 = 24.4.
    expect(group('guided=yes')).toMatchObject({ n: 5, medianHours: 4.5 });
    expect(group('guided=yes').meanHours).toBeCloseTo(4.9, 12);
    expect(group('guided=yes').p90Hours).toBeCloseTo(6.9, 12);
    expect(group('guided=no')).toMatchObject({ n: 5, medianHours: 12 });
    expect(group('guided=no').meanHours).toBeCloseTo(13.8, 12);
    expect(group('guided=no').p90Hours).toBeCloseTo(24.4, 12);
  });

  it('groups by crew and procedure', () => {
    expect(result.groups.map((g) => g.key)).toEqual([
      'all',
      'guided=yes',
      'guided=no',
      'crew=A',
      'crew=B',
      'procedure=pump-seal',
      'procedure=vessel-reload',
    ]);
    // crew A: 4.5, 2.5, 6, 16, 4 → median 4.5; procedure vessel-reload: 4.5, 12, 2.5, 30, 6 → median 6.
    expect(group('crew=A')).toMatchObject({ n: 5, medianHours: 4.5 });
    expect(group('procedure=vessel-reload')).toMatchObject({ n: 5, medianHours: 6 });
  });

  it('draws a learning curve by caller-given period and by job sequence', () => {
    const curve = timeToComplete({
      steps: stepsFor(),
      jobInfo,
      periods: [
        { label: '2025-Q1', start: at('2025-01-01T00:00:00Z'), end: at('2025-04-01T00:00:00Z') },
        { label: '2025-Q2', start: at('2025-04-01T00:00:00Z'), end: at('2025-07-01T00:00:00Z') },
      ],
      sequenceBucketSize: 4,
    }).learningCurve;
    // Starts 6 Jan + 10 days each: jobs 1–9 start in Q1 (the last on 27 Mar), job 10 on 6 Apr.
    expect(curve.byPeriod.map((b) => [b.label, b.n])).toEqual([
      ['2025-Q1', 9],
      ['2025-Q2', 1],
    ]);
    expect(curve.byPeriod[1]!.medianHours).toBe(8);
    expect(curve.bySequence.map((b) => [b.firstJob, b.lastJob, b.n, b.medianHours])).toEqual([
      [1, 4, 4, 8.25], // 4.5, 12, 2.5, 30 → (4.5 + 12)/2
      [5, 8, 4, 6.75], // 6, 3, 16, 7.5 → (6 + 7.5)/2
      [9, 10, 2, 6], // 4, 8
    ]);
  });
});

describe('time to complete, edges', () => {
  it('empty window: no jobs, groups listed with n 0 and null figures', () => {
    const result = timeToComplete({ steps: [] });
    expect(result.jobs).toEqual([]);
    expect(result.groups).toEqual([
      expect.objectContaining({
        key: 'all',
        n: 0,
        meanHours: null,
        medianHours: null,
        p90Hours: null,
        reason: 'no-jobs',
      }),
      expect.objectContaining({ key: 'guided=yes', n: 0, reason: 'no-jobs' }),
      expect.objectContaining({ key: 'guided=no', n: 0, reason: 'no-jobs' }),
    ]);
    expect(result.learningCurve.bySequence).toEqual([]);
  });

  it('zero and negative durations are skipped with a counted reason; nothing else is rejected', () => {
    const t = at('2025-02-01T08:00:00Z');
    const result = timeToComplete({
      steps: [
        { woNumber: 'Z', step: 1, startedAt: t, completedAt: t, guided: true },
        { woNumber: 'N', step: 1, startedAt: t, completedAt: at('2025-02-01T07:00:00Z'), guided: false },
        { woNumber: 'OK', step: 1, startedAt: t, completedAt: at('2025-02-01T09:30:00Z'), guided: false },
        { woNumber: 'BAD', step: 1, startedAt: at('not a date'), completedAt: t, guided: false },
      ],
    });
    expect(result.jobs.map((j) => [j.woNumber, j.hours])).toEqual([['OK', 1.5]]);
    expect(result.skipped).toEqual([
      { woNumber: 'Z', reason: 'non-positive-duration' },
      { woNumber: 'N', reason: 'non-positive-duration' },
      { woNumber: 'BAD', reason: 'invalid-time' },
    ]);
    expect(result.skippedCounts).toEqual({ 'non-positive-duration': 2, 'invalid-time': 1 });
  });

  it('one job: sd null (too few values), the quantiles equal its duration', () => {
    const result = timeToComplete({
      steps: [
        {
          woNumber: 'A',
          step: 1,
          startedAt: at('2025-03-01T08:00:00Z'),
          completedAt: at('2025-03-01T10:00:00Z'),
          guided: true,
        },
      ],
    });
    expect(result.groups[0]).toMatchObject({ n: 1, meanHours: 2, medianHours: 2, p90Hours: 2, sdHours: null });
    expect(result.groups[2]).toMatchObject({ key: 'guided=no', n: 0, reason: 'no-jobs' });
  });

  it('measures real elapsed time across the spring-forward change (Europe/Berlin, 31 March 2024)', () => {
    // 01:30 CET (+01:00) to 03:30 CEST (+02:00) is one real hour (hand-worked).
    const result = timeToComplete({
      steps: [
        {
          woNumber: 'DST',
          step: 1,
          startedAt: at('2024-03-31T01:30:00+01:00'),
          completedAt: at('2024-03-31T03:30:00+02:00'),
          guided: false,
        },
      ],
    });
    expect(result.jobs[0]!.hours).toBe(1);
  });

  it('refuses a bucket size that is not a whole number ≥ 1', () => {
    expect(() => timeToComplete({ steps: [], sequenceBucketSize: 0 })).toThrow(RangeError);
    expect(() => timeToComplete({ steps: [], sequenceBucketSize: 2.5 })).toThrow(RangeError);
  });
});
