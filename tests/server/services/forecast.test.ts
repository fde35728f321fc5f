// Replacement forecast through the importers and the service: calendar months in the site's zone,
// each month's expected count against the closed form of docs/design.md §6, the pooled fit of a group that
// has none of its own, cautions, and the edges.
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { fitWeibull } from '#shared/kpi/element-life.ts';
import { forecastQuerySchema, forecastReportSchema } from '#shared/schemas/forecast.ts';
import type { ForecastAnswer } from '#shared/kpi/forecast-report.ts';
import { getForecast } from '#server/services/forecast.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { importText } from '../importers/helpers.ts';
import { getSettings } from '#server/services/settings.ts';

let t: TestDatabase;
const DAY_MS = 86_400_000;

/** Lieblein & Zelen (1956), J. Res. NBS 57(5) RP2719, 23 ball-bearing lives (reference/checks.json), used as days. */
const liebleinZelen = [
  17.88, 28.92, 33.0, 41.52, 42.12, 45.6, 48.48, 51.84, 51.96, 54.12, 55.56, 67.8, 68.64, 68.64, 68.88, 84.12, 93.12, 98.64, 105.12,
  105.84, 127.92, 128.04, 173.4,
];

const assets = [
  'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  'T1,Train 1,train,,100,,,',
  'T1-S1,Train 1 stage 1,stage,T1,,,,',
  ...[1, 2, 3, 4].map((v) => `T1-S1-V0${v},Vessel ${v},vessel,T1-S1,,6,1,${v}`),
  'T2,Train 2,train,,100,,,',
  'T2-S1,Train 2 stage 1,stage,T2,,,,',
  'T2-S1-V01,Vessel 1,vessel,T2-S1,,6,1,1',
].join('\n');
const elementHeader = 'serial,model,vessel,position,installed_at,removed_at,removal_reason';
const iso = (ms: number) => new Date(ms).toISOString();

/** 2021-01-01 00:00 in Europe/Berlin (CET, UTC+1). */
const asOfMs = Date.parse('2020-12-31T23:00:00Z');
const ages = { N1: 30, N2: 60 };

async function site(code: string, elements: string[]) {
  expect((await importText(t.db, 'assets', assets, { site: code, tz: 'Europe/Berlin', fileName: `${code}.csv` })).status).toBe('completed');
  if (elements.length === 0) return;
  const e = await importText(t.db, 'elements', [elementHeader, ...elements].join('\n'), { site: code, fileName: `${code}-el.csv` });
  expect(e.rejects).toEqual([]);
}

async function forecast(query: Record<string, unknown>): Promise<ForecastAnswer> {
  const answer = await getForecast(t.db, forecastQuerySchema.parse(query), await getSettings(t.db));
  beforeFreshnessSchema(forecastReportSchema).parse(answer);
  return answer;
}

beforeAll(async () => {
  t = await createTestDatabase();
  const installed = Date.parse('2020-01-01T00:00:00Z');
  await site('FC', [
    ...liebleinZelen.map(
      (days, i) => `LZ-${i + 1},MX-400,T1-S1-V0${Math.floor(i / 6) + 1},${(i % 6) + 1},${iso(installed)},${iso(installed + Math.round(days * DAY_MS))},failed`,
    ),
    `N1,MX-400,T2-S1-V01,1,${iso(asOfMs - ages.N1 * DAY_MS)},,`,
    `N2,MX-400,T2-S1-V01,2,${iso(asOfMs - ages.N2 * DAY_MS)},,`,
  ]);
  // CENS: elements in service, none ever failed — no fit anywhere.
  await site('CENS', [`C1,MX-400,T1-S1-V01,1,2020-06-01T00:00:00Z,,`, `C2,MX-400,T1-S1-V01,2,2020-01-01T00:00:00Z,2020-09-01T00:00:00Z,planned`]);
  await site('NONE', []);
});
afterAll(() => t.close());

/** Weibull cumulative hazard H(x) = (x/η)^β. */
const hazard = (beta: number, eta: number) => (x: number) => (x / eta) ** beta;

describe('forecast: twelve calendar months from a known fit', () => {
  it('uses the fit of the lives up to the start: the 23 failures and the two elements in service, censored at their ages', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-01' });
    expect(r.asOf).toBe('2020-12-31T23:00:00.000Z');
    const g = r.groups.find((x) => x.key === 'all')!;
    const direct = fitWeibull([...liebleinZelen, ages.N1, ages.N2], [...liebleinZelen.map(() => true), false, false]);
    expect(g.weibull!.shape).toBeCloseTo(direct.fit!.shape, 8);
    expect(g.weibull!.scaleDays).toBeCloseTo(direct.fit!.scale, 6);
    expect(g.inService).toBe(2);
    expect(g.fitSource).toBe('group');
  });

  it('cuts months at local midnights of the 1st in the site zone (Europe/Berlin, summer time from 28 March)', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-01' });
    const months = r.groups[0]!.months;
    expect(months.map((m) => m.label)).toEqual(Array.from({ length: 12 }, (_, k) => `2021-${String(k + 1).padStart(2, '0')}`));
    expect(months.every((m) => !m.partial)).toBe(true);
    expect(months[0]!.from).toBe('2020-12-31T23:00:00.000Z');
    expect(months[2]!.to).toBe('2021-03-31T22:00:00.000Z'); // April 1st, 00:00 CEST
    expect(months[10]!.from).toBe('2021-10-31T23:00:00.000Z'); // November 1st, 00:00 CET
    expect(months[11]!.to).toBe('2021-12-31T23:00:00.000Z');
    expect(r.totals.map((x) => x.label)).toEqual(months.map((m) => m.label));
  });

  it('gives each month Σ exp(H(a) − H(a+s))·(1 − exp(H(a+s) − H(a+e))) and, for the first month, the closed form 1 − exp((a/η)^β − ((a+h)/η)^β)', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-01' });
    const g = r.groups[0]!;
    const H = hazard(g.weibull!.shape, g.weibull!.scaleDays);
    // docs/design.md §6: probability of a life-ending event within h of a unit of age a. January has h = 31 days.
    const closedForm = (a: number, h: number) => 1 - Math.exp(H(a) - H(a + h));
    expect(g.months[0]!.expectedCount).toBeCloseTo(closedForm(30, 31) + closedForm(60, 31), 10);
    for (const m of g.months) {
      const s = (Date.parse(m.from) - asOfMs) / DAY_MS;
      const e = (Date.parse(m.to) - asOfMs) / DAY_MS;
      const expected = [30, 60].reduce((sum, a) => sum + Math.exp(H(a) - H(a + s)) * closedForm(a + s, e - s), 0);
      expect(m.expectedCount).toBeCloseTo(expected, 10);
      // Cost = count × the element unit cost setting (default 620).
      expect(m.expectedCost).toBeCloseTo(expected * 620, 7);
      expect(m.countLower!).toBeLessThanOrEqual(m.expectedCount + 1e-12);
      expect(m.countUpper!).toBeGreaterThanOrEqual(m.expectedCount - 1e-12);
    }
    // Over the year (365 days of real time): the months add up to the closed form with h = 365.
    expect(g.total.expectedCount).toBeCloseTo(closedForm(30, 365) + closedForm(60, 365), 10);
    expect(r.totals[0]!.expectedCount).toBeCloseTo(g.months[0]!.expectedCount, 12);
    expect(r.currency).toBe('EUR');
    // Per element: probability by the end of the horizon, highest first.
    expect(g.elements!.map((e) => e.serial)).toEqual(['N2', 'N1']);
    expect(g.elements![1]!.probability).toBeCloseTo(closedForm(30, 365), 10);
  });

  it('carries the vessel-work cautions, the band method and provenance', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-01' });
    expect(r.cautions).toEqual(vesselWorkCautions);
    expect(r.cautions.join(' ')).toMatch(/release all pressure/);
    expect(r.bandMethod).toMatch(/likelihood-ratio confidence region/);
    expect(r.provenance!.elements).toEqual(['N1', 'N2']);
    expect(r.provenance!.windows.map((w) => w.what)).toEqual(['element lives used for the fits', 'forecast horizon']);
  });

  it('with renewal, also counts failures of the replacements (never fewer)', async () => {
    const first = await forecast({ site: 'FC', to: '2021-01-01' });
    const renewal = await forecast({ site: 'FC', to: '2021-01-01', renewal: 'true' });
    expect(renewal.renewal).toBe(true);
    expect(renewal.groups[0]!.total.expectedCount).toBeGreaterThan(first.groups[0]!.total.expectedCount);
    expect(renewal.groups[0]!.months[0]!.expectedCount).toBeCloseTo(first.groups[0]!.months[0]!.expectedCount, 12);
  });

  it('a start in the middle of a month adds the rest of that month, marked partial', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-15T12:00:00Z', months: 3 });
    const months = r.groups[0]!.months;
    expect(months.map((m) => [m.label, m.partial, m.from, m.to])).toEqual([
      ['2021-01', true, '2021-01-15T12:00:00.000Z', '2021-01-31T23:00:00.000Z'],
      ['2021-02', false, '2021-01-31T23:00:00.000Z', '2021-02-28T23:00:00.000Z'],
      ['2021-03', false, '2021-02-28T23:00:00.000Z', '2021-03-31T22:00:00.000Z'],
      ['2021-04', false, '2021-03-31T22:00:00.000Z', '2021-04-30T22:00:00.000Z'],
    ]);
  });

  it('a group with no life-ending event of its own borrows the pooled fit, and says so', async () => {
    const r = await forecast({ site: 'FC', to: '2021-01-01', groupBy: 'train' });
    expect(r.groups.map((g) => [g.key, g.inService, g.fitSource])).toEqual([
      ['train=T1', 0, 'group'],
      ['train=T2', 2, 'pooled'],
    ]);
    const all = await forecast({ site: 'FC', to: '2021-01-01' });
    const t2 = r.groups[1]!;
    expect(t2.weibull!.shape).toBeCloseTo(all.groups[0]!.weibull!.shape, 10);
    expect(t2.total.expectedCount).toBeCloseTo(all.groups[0]!.total.expectedCount, 10);
    expect(r.groups[0]!.total.expectedCount).toBe(0);
    expect(r.notes.join(' ')).toMatch(/train=T2: its own lives give no Weibull fit \(no-events\); the pooled fit/);
  });
});

describe('forecast: edges', () => {
  it('no life-ending event anywhere: no group is forecast, the notes say which elements and why', async () => {
    const r = await forecast({ site: 'CENS', to: '2021-01-01' });
    expect(r.groups).toEqual([]);
    expect(r.inService).toBe(1);
    expect(r.notes[0]).toMatch(/all: 1 element\(s\) in service are not forecast — no Weibull fit \(no-events\)/);
    expect(r.totals).toHaveLength(12);
    expect(r.totals.every((m) => m.expectedCount === 0)).toBe(true);
    expect(r.cautions).toEqual(vesselWorkCautions);
  });

  it('no elements at all: an empty answer with the cautions, not an error', async () => {
    const r = await forecast({ site: 'NONE' });
    expect(r.groups).toEqual([]);
    expect(r.inService).toBe(0);
    expect(r.notes).toContain('No element is in service at the forecast start in this scope.');
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('an element installed after the start is not in service at it', async () => {
    // N2 went in on 2020-11-01T23:00Z, N1 on 2020-12-01T23:00Z: on 15 November (2020-11-14T23:00Z) only N2 is in service, aged 13 days.
    const r = await forecast({ site: 'FC', to: '2020-11-15' });
    expect(r.groups[0]!.inService).toBe(1);
    expect(r.groups[0]!.elements!.map((e) => [e.serial, e.ageDays])).toEqual([['N2', expect.closeTo(13, 10)]]);
  });
});
