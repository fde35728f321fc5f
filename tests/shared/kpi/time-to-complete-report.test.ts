// buildTimeToCompleteReport (shared/kpi/time-to-complete-report.ts) on hand-worked invented jobs, without a
// database. Rules: docs/design.md §6 (Time to complete: jobs, groups, learning curve per calendar quarter in
// the site's zone) and §9 (vessel-work cautions). Quantiles are type 7 (Hyndman & Fan 1996, R's default):
// with n values sorted and h = (n − 1)p, Q(p) = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]).
import { describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import {
  buildTimeToCompleteReport,
  calendarQuarters,
  procedureDefinition,
  procedureOf,
  type TimeToCompleteJob,
  type TimeToCompleteReportInput,
} from '#shared/kpi/time-to-complete-report.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { quantileMethodType7, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';

const t = (iso: string) => new Date(iso);
const job = (woNumber: string, start: string, hours: number, o: Partial<TimeToCompleteJob> = {}): TimeToCompleteJob => ({
  woNumber,
  startedAt: t(start),
  completedAt: new Date(t(start).getTime() + hours * 3_600_000),
  guided: false,
  steps: 1,
  type: 'corrective',
  crew: null,
  assetKind: 'vessel',
  ...o,
});
// Site zone Europe/Berlin. WO-A starts at 22:30 UTC on 31 March 2024, i.e. 00:30 on 1 April in Berlin (summer
// time began that morning): a second-quarter job there, though still March in UTC.
const jobs = [
  job('WO-A', '2024-03-31T22:30:00Z', 2, { guided: true, crew: 'crew-a' }), // element replacement
  job('WO-B', '2024-03-15T08:00:00Z', 4, { type: 'inspection', crew: 'crew-b', steps: 2 }), // vessel inspection
  job('WO-C', '2024-05-10T06:00:00Z', 6, { assetKind: 'pump', steps: 3 }), // pump corrective
  job('WO-D', '2024-05-11T06:00:00Z', 0), // no positive duration: left out
];
const input: TimeToCompleteReportInput = {
  site: 'TTC',
  timeZone: 'Europe/Berlin',
  workOrderExtent: { from: t('2024-03-01T00:00:00Z'), to: t('2024-05-01T00:00:01Z') },
  jobs,
};
const noBounds = { from: null, to: null };

const exact = (answer: ReturnType<typeof buildTimeToCompleteReport>) => expect(beforeFreshnessSchema(timeToCompleteReportSchema).parse(answer)).toEqual(answer);

describe('buildTimeToCompleteReport', () => {
  const r = buildTimeToCompleteReport(input, noBounds);
  const group = (key: string) => r.groups.find((g) => g.key === key);

  it('answers exactly the schema, with the cautions of vessel work and the procedure rule', () => {
    exact(r);
    expect(r).toMatchObject({ site: 'TTC', quantileMethod: quantileMethodType7, procedureDefinition });
    expect(r.cautions).toEqual([...vesselWorkCautions]);
  });

  it('lists the jobs in start order, and the one it leaves out with why', () => {
    expect(r.jobs.map((j) => [j.woNumber, j.startedAt, j.hours, j.steps, j.crew, j.procedure])).toEqual([
      ['WO-B', '2024-03-15T08:00:00.000Z', 4, 2, 'crew-b', 'vessel inspection'],
      ['WO-A', '2024-03-31T22:30:00.000Z', 2, 1, 'crew-a', 'element replacement'],
      ['WO-C', '2024-05-10T06:00:00.000Z', 6, 3, null, 'pump corrective'],
    ]);
    expect(r.skipped).toEqual([{ woNumber: 'WO-D', reason: 'non-positive-duration' }]);
  });

  it('gives every group its figures, by type 7 quantiles', () => {
    // all: 2 4 6 → mean 4, median 4; p90: h = 1.8 → 4 + 0.8·2 = 5.6; sd √((4 + 0 + 4)/2) = 2.
    expect(group('all')).toEqual({ key: 'all', n: 3, meanHours: 4, medianHours: 4, p90Hours: expect.closeTo(5.6, 12), sdHours: 2, minHours: 2, maxHours: 6 });
    // guided=yes: WO-A alone; sd needs two jobs.
    expect(group('guided=yes')).toEqual({ key: 'guided=yes', n: 1, meanHours: 2, medianHours: 2, p90Hours: 2, sdHours: null, minHours: 2, maxHours: 2 });
    // guided=no: 4 6 → mean 5; p90: h = 0.9 → 4 + 0.9·2 = 5.8; sd √((1 + 1)/1) = √2.
    expect(group('guided=no')).toEqual({ key: 'guided=no', n: 2, meanHours: 5, medianHours: 5, p90Hours: expect.closeTo(5.8, 12), sdHours: expect.closeTo(Math.SQRT2, 12), minHours: 4, maxHours: 6 });
    expect(r.groups.map((g) => g.key)).toEqual([
      'all',
      'guided=yes',
      'guided=no',
      'crew=crew-a',
      'crew=crew-b',
      'procedure=element replacement',
      'procedure=pump corrective',
      'procedure=vessel inspection',
    ]);
  });

  it('draws the learning curve by calendar quarter of the site’s zone, and by runs of 10 jobs', () => {
    // Berlin quarters: Q1 from 1 Jan 00:00 CET (31 Dec 23:00 UTC) to 1 Apr 00:00 CEST (31 Mar 22:00 UTC).
    // Q1: WO-B 4 h; Q2: WO-A 2 h and WO-C 6 h → median and mean 4. The quarters run to the last start read, WO-D's.
    expect(r.learningCurve.byPeriod).toEqual([
      { label: '2024-Q1', start: '2023-12-31T23:00:00.000Z', end: '2024-03-31T22:00:00.000Z', n: 1, medianHours: 4, meanHours: 4 },
      { label: '2024-Q2', start: '2024-03-31T22:00:00.000Z', end: '2024-06-30T22:00:00.000Z', n: 2, medianHours: 4, meanHours: 4 },
    ]);
    expect(r.learningCurve.bySequence).toEqual([
      { label: 'jobs 1–3', start: '2024-03-15T08:00:00.000Z', end: '2024-05-10T06:00:00.000Z', firstJob: 1, lastJob: 3, n: 3, medianHours: 4, meanHours: 4 },
    ]);
  });

  it('without bounds, takes the work orders’ extent widened to every job read, one second past the last start', () => {
    // Extent 1 Mar – 1 May 00:00:01; the first start (15 Mar) is inside it, the last (WO-D, 11 May 06:00) is not.
    expect([r.from, r.to]).toEqual(['2024-03-01T00:00:00.000Z', '2024-05-11T06:00:01.000Z']);
    expect(r.provenance).toEqual({
      workOrders: ['WO-A', 'WO-B', 'WO-C'],
      workOrderCount: 3,
      tags: [],
      windows: [{ from: '2024-03-01T00:00:00.000Z', to: '2024-05-11T06:00:01.000Z', what: 'jobs whose first step started in this window' }],
    });
    const early = buildTimeToCompleteReport({ ...input, workOrderExtent: { from: t('2024-04-01T00:00:00Z'), to: null } }, noBounds);
    expect(early.from).toBe('2024-03-15T08:00:00.000Z');
  });

  it('keeps the bounds the query gives, and groupBy keeps `all` and one kind of group', () => {
    const bounded = buildTimeToCompleteReport(input, { from: t('2024-03-10T00:00:00Z'), to: t('2024-05-01T00:00:00Z'), groupBy: 'crew' });
    expect([bounded.from, bounded.to]).toEqual(['2024-03-10T00:00:00.000Z', '2024-05-01T00:00:00.000Z']);
    expect(bounded.groups.map((g) => g.key)).toEqual(['all', 'crew=crew-a', 'crew=crew-b']);
    expect(buildTimeToCompleteReport(input, { ...noBounds, groupBy: 'all' }).groups.map((g) => g.key)).toEqual(['all']);
  });
});

describe('degenerate input', () => {
  it('no jobs and no work orders: no window, n = 0 groups with null figures and the reason', () => {
    const r = buildTimeToCompleteReport({ ...input, workOrderExtent: { from: null, to: null }, jobs: [] }, noBounds);
    exact(r);
    expect([r.from, r.to, r.jobs, r.provenance.windows]).toEqual([null, null, [], []]);
    expect(r.groups).toEqual([
      { key: 'all', n: 0, meanHours: null, medianHours: null, p90Hours: null, sdHours: null, minHours: null, maxHours: null, reason: 'no-jobs' },
      { key: 'guided=yes', n: 0, meanHours: null, medianHours: null, p90Hours: null, sdHours: null, minHours: null, maxHours: null, reason: 'no-jobs' },
      { key: 'guided=no', n: 0, meanHours: null, medianHours: null, p90Hours: null, sdHours: null, minHours: null, maxHours: null, reason: 'no-jobs' },
    ]);
    expect(r.learningCurve).toEqual({ byPeriod: [], bySequence: [] });
  });
});

describe('procedures and quarters', () => {
  it('names procedures from the asset kind and the work-order type (procedureDefinition)', () => {
    expect(procedureOf({ assetKind: 'vessel', type: 'corrective' })).toBe('element replacement');
    expect(procedureOf({ assetKind: 'vessel', type: 'inspection' })).toBe('vessel inspection');
    expect(procedureOf({ assetKind: 'filter', type: 'preventive' })).toBe('filter preventive');
  });

  it('runs quarters from the first to the last instant’s, in the zone given', () => {
    // 15 Nov 2023 to 2 Feb 2024 in UTC: 2023-Q4 and 2024-Q1, bounds at UTC midnights.
    expect(calendarQuarters(t('2023-11-15T00:00:00Z'), t('2024-02-02T00:00:00Z'), 'UTC').map((q) => [q.label, q.start.toISOString(), q.end.toISOString()])).toEqual([
      ['2023-Q4', '2023-10-01T00:00:00.000Z', '2024-01-01T00:00:00.000Z'],
      ['2024-Q1', '2024-01-01T00:00:00.000Z', '2024-04-01T00:00:00.000Z'],
    ]);
  });
});
