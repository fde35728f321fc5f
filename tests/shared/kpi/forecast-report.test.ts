// The replacement forecast answer built from plain rows, without a database. Rules: docs/design.md §6
// (Replacement forecast: elements in service at the window's end, their ages, the fit of their group, the
// pooled fit of a group without one, calendar months in the site's zone). Element lives: the 23 ball-bearing
// lives of Lieblein & Zelen (1956), J. Res. NBS 57(5) RP2719, used as days; their Weibull MLE
// β = 2.102058875, η = 81.87833405 (the project's reference checks, as in tests/shared/kpi/forecast.test.ts).
// Month boundaries: Europe/Berlin keeps CET (UTC+1) in winter and CEST (UTC+2) from the last Sunday of March
// to the last Sunday of October (EU Directive 2000/84/EC; 2021: 28 March and 31 October).
import { isDeepStrictEqual } from 'node:util';
import { describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import type { ElementInstall, VesselPlace } from '#shared/kpi/element-life-report.ts';
import { fitWeibull } from '#shared/kpi/element-life.ts';
import {
  buildForecastReport,
  forecastElementListCap,
  forecastMonths,
  inServiceAt,
  type ForecastAnswer,
  type ForecastReportInput,
  type ForecastWindow,
} from '#shared/kpi/forecast-report.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';

const DAY_MS = 86_400_000;
const liebleinZelen = [
  17.88, 28.92, 33.0, 41.52, 42.12, 45.6, 48.48, 51.84, 51.96, 54.12, 55.56, 67.8, 68.64, 68.64, 68.88, 84.12, 93.12, 98.64, 105.12,
  105.84, 127.92, 128.04, 173.4,
];
const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

// Vessel 1 in train T1, vessel 2 in train T2.
const places = new Map<number, VesselPlace>([
  [1, { vessel: 'T1-V1', stage: 'T1-S1', train: 'T1' }],
  [2, { vessel: 'T2-V1', stage: 'T2-S1', train: 'T2' }],
]);
/** 2021-01-01 00:00 in Europe/Berlin (CET). */
const asOf = new Date('2020-12-31T23:00:00Z');
const start = Date.parse('2020-01-01T00:00:00Z');

let id = 0;
const install = (serial: string, vesselId: number, installedMs: number, removedMs: number | null, reason: string | null): ElementInstall => ({
  id: ++id,
  serial,
  model: 'MX-400',
  vesselId,
  position: 1,
  installedAt: new Date(installedMs),
  removedAt: removedMs === null ? null : new Date(removedMs),
  removalReason: reason,
});

// The 23 bearing lives in T1, all failed before the start; N1 and N2 in T2, in service, aged 30 and 60 days at it.
const bearings = liebleinZelen.map((days, i) => install(`LZ-${i + 1}`, 1, start, start + Math.round(days * DAY_MS), 'failed'));
const inService = [install('N1', 2, asOf.getTime() - 30 * DAY_MS, null, null), install('N2', 2, asOf.getTime() - 60 * DAY_MS, null, null)];
const input: ForecastReportInput = { site: 'FC', timeZone: 'Europe/Berlin', places, installs: [...bearings, ...inService] };
const window: ForecastWindow = { from: new Date(start), to: asOf, now: new Date('2030-01-01T00:00:00Z'), confidence: 0.9, groupBy: 'train', months: 12, renewal: false };
const settings = { elementUnitCost: 620, currency: 'EUR' };

function checkedAgainstSchema(report: ForecastAnswer): ForecastAnswer {
  const parsed = beforeFreshnessSchema(forecastReportSchema).parse(report);
  expect(isDeepStrictEqual(JSON.parse(JSON.stringify(parsed)), JSON.parse(JSON.stringify(report)))).toBe(true);
  expect(JSON.stringify(report)).not.toMatch(/NaN|Infinity/);
  return report;
}

describe('forecastMonths: calendar months in the site’s zone', () => {
  it('starts on a local 1st with twelve whole months, an hour shorter in March and longer in October (Europe/Berlin)', () => {
    const months = forecastMonths(asOf, 12, 'Europe/Berlin');
    expect(months).toHaveLength(12);
    expect(months.every((m) => !m.partial)).toBe(true);
    expect(months[0]).toMatchObject({ label: '2021-01', start: new Date('2020-12-31T23:00:00Z'), end: new Date('2021-01-31T23:00:00Z') });
    expect(months[2]!.end).toEqual(new Date('2021-03-31T22:00:00Z')); // 1 April, 00:00 CEST
    expect((months[2]!.end.getTime() - months[2]!.start.getTime()) / 3_600_000).toBe(31 * 24 - 1);
    expect((months[9]!.end.getTime() - months[9]!.start.getTime()) / 3_600_000).toBe(31 * 24 + 1);
    expect(months[11]!.end).toEqual(new Date('2021-12-31T23:00:00Z'));
  });

  it('starts inside a month with the rest of it, marked partial, then the whole months', () => {
    const months = forecastMonths(new Date('2021-01-15T12:00:00Z'), 2, 'Europe/Berlin');
    expect(months.map((m) => [m.label, m.partial, m.start.toISOString(), m.end.toISOString()])).toEqual([
      ['2021-01', true, '2021-01-15T12:00:00.000Z', '2021-01-31T23:00:00.000Z'],
      ['2021-02', false, '2021-01-31T23:00:00.000Z', '2021-02-28T23:00:00.000Z'],
      ['2021-03', false, '2021-02-28T23:00:00.000Z', '2021-03-31T22:00:00.000Z'],
    ]);
  });
});

describe('inServiceAt', () => {
  it('counts an element installed before the start and removed at it or later, however long ago it was installed (docs/design.md §6)', () => {
    const old = install('OLD', 1, Date.parse('2010-01-01T00:00:00Z'), null, null);
    const leavesThen = install('AT', 1, start, asOf.getTime(), 'planned');
    const gone = install('GONE', 1, start, asOf.getTime() - 1, 'planned');
    const later = install('LATER', 1, asOf.getTime(), null, null);
    expect(inServiceAt([old, leavesThen, gone, later], asOf).map((e) => e.serial)).toEqual(['OLD', 'AT']);
  });
});

describe('buildForecastReport, grouped by train', () => {
  const report = checkedAgainstSchema(buildForecastReport(input, window, settings));
  const [t1, t2] = report.groups;

  it('fits T1 on its own 23 failures, which gives the published bearing MLE (Lieblein & Zelen 1956)', () => {
    expect(t1).toMatchObject({ key: 'train=T1', inService: 0, fitSource: 'group', elements: [] });
    expect(relErr(t1!.weibull.shape, 2.102058875)).toBeLessThan(1e-6);
    expect(relErr(t1!.weibull.scaleDays, 81.87833405)).toBeLessThan(1e-6);
    expect(t1!.total.expectedCount).toBe(0);
  });

  it('lends T2, whose two lives are both censored, the pooled fit of every life in scope, and says so', () => {
    expect(t2).toMatchObject({ key: 'train=T2', inService: 2, fitSource: 'pooled' });
    const pooled = fitWeibull([...bearings.map((e) => (e.removedAt!.getTime() - start) / DAY_MS), 30, 60], [...bearings.map(() => true), false, false], { confidence: 0.9 }).fit!;
    expect(t2!.weibull.shape).toBeCloseTo(pooled.shape, 10);
    expect(t2!.weibull.scaleDays).toBeCloseTo(pooled.scale, 8);
    expect(report.notes).toContain('train=T2: its own lives give no Weibull fit (no-events); the pooled fit of every life in scope is used.');
  });

  it('gives each month Σ exp(H(a) − H(a+s))·(1 − exp(H(a+s) − H(a+e))) over ages 30 and 60 d, cost at 620 each (docs/design.md §6)', () => {
    const { shape, scaleDays } = t2!.weibull;
    const H = (x: number) => (x / scaleDays) ** shape;
    // January: s = 0, e = 31 d → the closed form 1 − exp(H(a) − H(a + 31)).
    const january = [30, 60].reduce((sum, a) => sum + 1 - Math.exp(H(a) - H(a + 31)), 0);
    expect(t2!.months[0]!.expectedCount).toBeCloseTo(january, 12);
    expect(t2!.months[0]!.expectedCost).toBeCloseTo(january * 620, 9);
    for (const m of t2!.months) {
      const s = (Date.parse(m.from) - asOf.getTime()) / DAY_MS;
      const e = (Date.parse(m.to) - asOf.getTime()) / DAY_MS;
      const expected = [30, 60].reduce((sum, a) => sum + Math.exp(H(a) - H(a + s)) * (1 - Math.exp(H(a + s) - H(a + e))), 0);
      expect(m.expectedCount).toBeCloseTo(expected, 12);
      expect(m.countLower!).toBeLessThanOrEqual(m.expectedCount + 1e-12);
      expect(m.countUpper!).toBeGreaterThanOrEqual(m.expectedCount - 1e-12);
    }
    // N2, older under an increasing hazard (β > 1), is listed first; its probability over the year is 1 − exp(H(60) − H(425)).
    expect(t2!.elements.map((e) => e.serial)).toEqual(['N2', 'N1']);
    expect(t2!.elements[0]!.probability).toBeCloseTo(1 - Math.exp(H(60) - H(60 + 365)), 12);
    expect(t2!.elements[0]!.ageDays).toBeCloseTo(60, 12);
  });

  it('adds the groups month by month in the totals', () => {
    expect(report.totals).toHaveLength(12);
    expect(report.totals[0]).toEqual({
      label: '2021-01',
      from: '2020-12-31T23:00:00.000Z',
      to: '2021-01-31T23:00:00.000Z',
      expectedCount: t1!.months[0]!.expectedCount + t2!.months[0]!.expectedCount,
      expectedCost: t1!.months[0]!.expectedCost + t2!.months[0]!.expectedCost,
    });
  });

  it('carries the vessel-work cautions, the settings’ currency, the in-service count and the provenance', () => {
    expect(report.cautions).toEqual(vesselWorkCautions);
    expect(report).toMatchObject({ site: 'FC', asOf: '2020-12-31T23:00:00.000Z', currency: 'EUR', inService: 2, renewal: false, groupBy: 'train', confidence: 0.9 });
    expect(report.provenance).toEqual({
      workOrders: [],
      tags: [],
      windows: [
        { from: '2020-01-01T00:00:00.000Z', to: '2020-12-31T23:00:00.000Z', what: 'element lives used for the fits' },
        { from: '2020-12-31T23:00:00.000Z', to: '2021-12-31T23:00:00.000Z', what: 'forecast horizon' },
      ],
      elements: ['N1', 'N2'],
      elementCount: 2,
    });
    expect(report.windowTreatment).toMatchObject({ enteredLate: 0, censoredAtEnd: 2 });
    expect(report.windowTreatment.text).toMatch(/^The forecast covers the 2 element\(s\) in service at the window's end/);
    expect(report.notes.at(-1)).toBe(report.windowTreatment.text);
  });
});

describe('edges', () => {
  it('no life-ending event anywhere: nothing is forecast, and the notes say which elements and why', () => {
    const censored: ForecastReportInput = { ...input, installs: inService };
    const all = checkedAgainstSchema(buildForecastReport(censored, { ...window, groupBy: 'all' }, settings));
    expect(all.groups).toEqual([]);
    expect(all.inService).toBe(2);
    expect(all.notes[0]).toBe('all: 2 element(s) in service are not forecast — no Weibull fit (no-events).');
    expect(all.totals.every((m) => m.expectedCount === 0 && m.expectedCost === 0)).toBe(true);
    const byTrain = buildForecastReport(censored, window, settings);
    expect(byTrain.notes[0]).toBe('train=T2: 2 element(s) in service are not forecast — no Weibull fit (no-events; pooled: no-events).');
    expect(byTrain.cautions).toEqual(vesselWorkCautions);
  });

  it('no data and no window: the forecast starts now, with empty groups, zero totals and the cautions', () => {
    const now = new Date('2026-03-10T12:00:00Z');
    const report = checkedAgainstSchema(buildForecastReport({ site: 'NONE', timeZone: 'UTC', places: new Map(), installs: [] }, { ...window, from: null, to: null, now, groupBy: 'all' }, settings));
    expect(report.asOf).toBe('2026-03-10T12:00:00.000Z');
    expect(report.groups).toEqual([]);
    // The rest of March, then twelve months.
    expect(report.totals.map((t) => t.label)).toEqual(['2026-03', '2026-04', '2026-05', '2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11', '2026-12', '2027-01', '2027-02', '2027-03']);
    expect(report.totals.every((t) => t.expectedCount === 0)).toBe(true);
    expect(report.notes[0]).toBe('No element is in service at the forecast start in this scope.');
    expect(report.provenance).toEqual({
      workOrders: [],
      tags: [],
      windows: [{ from: '2026-03-10T12:00:00.000Z', to: '2027-04-01T00:00:00.000Z', what: 'forecast horizon' }],
      elements: [],
      elementCount: 0,
    });
    expect(report.cautions).toEqual(vesselWorkCautions);
  });

  it(`lists at most ${forecastElementListCap} elements per group, the most likely first, and says how many there are`, () => {
    // Ages 1 … 501 days at the start.
    const many = Array.from({ length: forecastElementListCap + 1 }, (_, i) => install(`M-${i + 1}`, 1, asOf.getTime() - (i + 1) * DAY_MS, null, null));
    const report = checkedAgainstSchema(buildForecastReport({ ...input, installs: [...bearings, ...many] }, { ...window, groupBy: 'all' }, settings));
    const g = report.groups[0]!;
    expect(g.inService).toBe(forecastElementListCap + 1);
    expect(g.elements).toHaveLength(forecastElementListCap);
    const p = g.elements.map((e) => e.probability);
    expect(p).toEqual([...p].sort((a, b) => b - a));
    // The one left out is no more likely than the last listed: 1 − exp(H(a) − H(a + 365)) at its age.
    const H = (x: number) => (x / g.weibull.scaleDays) ** g.weibull.shape;
    const left = many.find((e) => !g.elements.some((l) => l.serial === e.serial))!;
    const age = (asOf.getTime() - left.installedAt.getTime()) / DAY_MS;
    expect(1 - Math.exp(H(age) - H(age + 365))).toBeLessThanOrEqual(p.at(-1)! + 1e-12);
    expect(report.notes).toContain(`all: the ${forecastElementListCap} elements most likely to need replacing are listed, of ${forecastElementListCap + 1}.`);
  });

  it('with renewal, replacements add failures: never fewer in total, the same in the first month', () => {
    const first = buildForecastReport(input, { ...window, groupBy: 'all' }, settings);
    const renewal = buildForecastReport(input, { ...window, groupBy: 'all', renewal: true }, settings);
    expect(renewal.renewal).toBe(true);
    expect(renewal.groups[0]!.total.expectedCount).toBeGreaterThan(first.groups[0]!.total.expectedCount);
    expect(renewal.groups[0]!.months[0]!.expectedCount).toBeCloseTo(first.groups[0]!.months[0]!.expectedCount, 12);
  });
});
