// Element life through the importers and the service: the window rule, grouping, Kaplan–Meier by
// hand, and a published Weibull fit reproduced after the lives went through CSV, database and back.
import { beforeFreshnessSchema, type BeforeFreshness } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fitWeibull } from '#shared/kpi/element-life.ts';
import { elementLifeQuerySchema, elementLifeReportSchema, type ElementLifeReport } from '#shared/schemas/element-life.ts';
import { HttpError } from '#server/errors.ts';
import { getElementLife } from '#server/services/element-life.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { importText } from '../importers/helpers.ts';

let t: TestDatabase;
const DAY_MS = 86_400_000;

/**
 * Lieblein & Zelen (1956), J. Res. Natl. Bur. Stand. 57(5) RP2719: endurance of 23 deep-groove ball
 * bearings, millions of revolutions (copied from /work/shared/reference/checks.json). Used here as
 * element lives in days, all failed: complete data.
 */
const liebleinZelen = [
  17.88, 28.92, 33.0, 41.52, 42.12, 45.6, 48.48, 51.84, 51.96, 54.12, 55.56, 67.8, 68.64, 68.64, 68.88, 84.12, 93.12, 98.64, 105.12,
  105.84, 127.92, 128.04, 173.4,
];

const assetHeader = 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col';
const elementHeader = 'serial,model,vessel,position,installed_at,removed_at,removal_reason';
/** An invented plant: two trains, one stage each, four vessels of six elements on train 1, one on train 2. */
const assets = [
  assetHeader,
  'T1,Train 1,train,,100,,,',
  'T1-S1,Train 1 stage 1,stage,T1,,,,',
  'T1-S1-V01,Vessel 1,vessel,T1-S1,,6,1,1',
  'T1-S1-V02,Vessel 2,vessel,T1-S1,,6,1,2',
  'T1-S1-V03,Vessel 3,vessel,T1-S1,,6,1,3',
  'T1-S1-V04,Vessel 4,vessel,T1-S1,,6,1,4',
  'T1-HPP,High-pressure pump,pump,T1,,,,',
  'T2,Train 2,train,,100,,,',
  'T2-S1,Train 2 stage 1,stage,T2,,,,',
  'T2-S1-V01,Vessel 1,vessel,T2-S1,,6,1,1',
].join('\n');

const iso = (ms: number) => new Date(ms).toISOString();
const day0 = Date.parse('2021-01-01T00:00:00Z');
const at = (days: number) => iso(day0 + days * DAY_MS);

async function site(code: string, elements: string[], tz = 'UTC') {
  const a = await importText(t.db, 'assets', assets, { site: code, tz, fileName: `${code}-assets.csv` });
  expect(a.status).toBe('completed');
  if (elements.length > 0) {
    const e = await importText(t.db, 'elements', [elementHeader, ...elements].join('\n'), { site: code, fileName: `${code}-elements.csv` });
    expect(e.rejects).toEqual([]);
    expect(e.status).toBe('completed');
  }
}

function report(query: Record<string, unknown>): Promise<BeforeFreshness<ElementLifeReport>> {
  return getElementLife(t.db, elementLifeQuerySchema.parse(query)).then((r) => beforeFreshnessSchema(elementLifeReportSchema).parse(r));
}

const group = (r: BeforeFreshness<ElementLifeReport>, key: string) => {
  const g = r.groups.find((x) => x.key === key);
  if (!g) throw new Error(`no group ${key} in ${r.groups.map((x) => x.key).join(', ')}`);
  return g;
};

beforeAll(async () => {
  t = await createTestDatabase();
  // LZ: the 23 lives, each in its own position, installed together, all removed as failed.
  const installed = Date.parse('2020-01-01T00:00:00Z');
  await site(
    'LZ',
    liebleinZelen.map((days, i) => {
      const vessel = `T1-S1-V0${Math.floor(i / 6) + 1}`;
      const removed = installed + Math.round(days * DAY_MS);
      return `LZ-${String(i + 1).padStart(2, '0')},MX-400,${vessel},${(i % 6) + 1},${iso(installed)},${iso(removed)},failed`;
    }),
  );
  // KM: a register worked by hand (days after 2021-01-01, window end 2022-01-01 = day 365).
  await site('KM', [
    `A1,MX-400,T1-S1-V01,1,${at(0)},${at(100)},failed`, // event at 100
    `A2,MX-400,T1-S1-V01,2,${at(0)},${at(200)},planned`, // censored at 200
    `A3,MX-400,T1-S1-V01,3,${at(0)},${at(300)},performance`, // event at 300
    `A4,MX-400,T1-S1-V01,4,${at(0)},,`, // in service: censored at 365
    `C1,MX-440,T1-S1-V01,5,2021-07-01T00:00:00Z,2022-02-01T00:00:00Z,failed`, // removed after the window: censored at 184
    `D1,MX-440,T1-S1-V01,6,2022-03-01T00:00:00Z,,`, // installed after the window: left out
    `B1,MX-400,T2-S1-V01,1,${at(0)},${at(150)},damaged`, // event at 150
    `B2,MX-400,T2-S1-V01,2,${at(0)},${at(250)},relocated`, // censored at 250
    `B3,MX-440,T2-S1-V01,1,${at(150)},,in service`, // censored at 365 − 150 = 215
  ]);
  // SAME: three elements that all failed at 200 days.
  await site('SAME', [0, 1, 2].map((i) => `S${i},MX-400,T1-S1-V01,${i + 1},${at(0)},${at(200)},failed`));
  // EMPTY: assets, no elements.
  await site('EMPTY', []);
});
afterAll(() => t.close());

describe('element life: Lieblein–Zelen ball-bearing lives loaded as element lives', () => {
  it('reproduces the published Weibull MLE after the importer, the database and the service', async () => {
    const r = await report({ site: 'LZ', to: '2021-01-01T00:00:00Z' });
    const all = group(r, 'all');
    expect([all.n, all.events]).toEqual([23, 23]);
    // Lieblein & Zelen (1956) data; MLE shape 2.102 (Dekking et al., textbook exercise, read), scale 81.88
    // (Lawless, from memory); 10-digit values recomputed with scipy weibull_min.fit (reference/checks.json).
    expect(all.weibull!.shape).toBeCloseTo(2.102, 3);
    expect(all.weibull!.scaleDays).toBeCloseTo(81.88, 2);
    expect(Math.abs(all.weibull!.shape / 2.102058875 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(all.weibull!.scaleDays / 81.87833405 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(all.weibull!.logLik! / -113.6912909 - 1)).toBeLessThan(1e-4);
    // B10 = η(−ln 0.9)^{1/β}, B50 = η(ln 2)^{1/β}, mean = ηΓ(1 + 1/β) (reference/checks.json, own computation).
    expect(Math.abs(all.b10Days! / 28.06941401 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(all.medianDays! / 68.77741335 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(all.meanDays! / 72.51865178 - 1)).toBeLessThan(1e-4);
    // Median-rank regression with Bernard ranks (reference/checks.json: numpy.polyfit, own computation).
    const mrr = all.medianRankRegression!;
    expect(Math.abs(mrr.yOnX.shape / 2.181228876 - 1)).toBeLessThan(1e-5);
    expect(Math.abs(mrr.yOnX.scaleDays / 81.57757427 - 1)).toBeLessThan(1e-5);
    expect(Math.abs(mrr.xOnY.shape / 2.247892555 - 1)).toBeLessThan(1e-5);
    expect(Math.abs(mrr.xOnY.scaleDays / 80.97235179 - 1)).toBeLessThan(1e-5);
    expect(mrr.correlation).toBeCloseTo(0.9850603641, 8);
    // The likelihood-ratio interval brackets the estimate.
    expect(all.weibull!.shapeLower!).toBeLessThan(all.weibull!.shape);
    expect(all.weibull!.shapeUpper!).toBeGreaterThan(all.weibull!.shape);
  });

  it('gives the empirical survival (n − i)/n for complete data, with the tie at 68.64 taken as one step of two', async () => {
    const all = group(await report({ site: 'LZ', to: '2021-01-01T00:00:00Z' }), 'all');
    expect(all.km).toHaveLength(22); // 23 lives, one tied pair
    // Hand-worked: after the 1st of 23 failures S = 22/23; 68.64 is the 13th and 14th → S = 9/23.
    expect(all.km[0]!.tDays).toBeCloseTo(17.88, 9);
    expect(all.km[0]!.survival).toBeCloseTo(22 / 23, 12);
    const tie = all.km.find((p) => Math.abs(p.tDays - 68.64) < 1e-6)!;
    expect([tie.nRisk, tie.nEvents]).toEqual([11, 2]);
    expect(tie.survival).toBeCloseTo(9 / 23, 12);
    expect(all.km[all.km.length - 1]!.survival).toBe(0);
    // KM median: the 12th of 23 ordered lives (S = 11/23 < 0.5 first there), 67.8 days.
    expect(all.kmMedianDays).toBeCloseTo(67.8, 9);
  });
});

describe('element life: a register worked by hand', () => {
  it('applies the window rule: installs before the end, censored at the end, later installs left out', async () => {
    const r = await report({ site: 'KM', from: '2021-01-01', to: '2022-01-01' });
    const all = group(r, 'all');
    // Lives: 100 E, 150 E, 184 C, 200 C, 215 C, 250 C, 300 E, 365 C (D1 installed after the window).
    expect([all.n, all.events]).toEqual([8, 3]);
    expect(all.km.map((p) => [Math.round(p.tDays * 1e6) / 1e6, p.nRisk, p.nEvents, p.nCensored])).toEqual([
      [100, 8, 1, 0],
      [150, 7, 1, 0],
      [184, 6, 0, 1],
      [200, 5, 0, 1],
      [215, 4, 0, 1],
      [250, 3, 0, 1],
      [300, 2, 1, 0],
      [365, 1, 0, 1],
    ]);
    // Product-limit by hand: 7/8 = 0.875; × 6/7 = 0.75; × 1/2 = 0.375.
    expect(all.km.map((p) => p.survival)).toEqual([0.875, 0.75, 0.75, 0.75, 0.75, 0.75, 0.375, 0.375].map((s) => expect.closeTo(s, 12)));
    // Greenwood at 300: 0.375·√(1/(8·7) + 1/(7·6) + 1/(2·1)) = 0.375·√0.541666… = 0.2759925…
    expect(all.km[6]!.se).toBeCloseTo(0.375 * Math.sqrt(1 / 56 + 1 / 42 + 1 / 2), 12);
    // Log-transformed 90 % bounds: S·exp(∓1.6448536·√Σ) (normal quantile 0.95, R survfit convention).
    const root = Math.sqrt(1 / 56 + 1 / 42 + 1 / 2);
    expect(all.km[6]!.lower).toBeCloseTo(0.375 * Math.exp(-1.6448536269514722 * root), 12);
    expect(all.kmMedianDays).toBeCloseTo(300, 9);
    expect(r.provenance!.elements).toEqual(['A1', 'A2', 'A3', 'A4', 'B1', 'B2', 'B3', 'C1']);
    // The schema strips keys it does not know; the service's own object carries the full count too.
    const raw = await getElementLife(t.db, elementLifeQuerySchema.parse({ site: 'KM', from: '2021-01-01', to: '2022-01-01' }));
    expect((raw.provenance as unknown as { elementCount: number }).elementCount).toBe(8);
  });

  it('fits the Weibull to exactly those lives (the MLE scale is (Σ t^β / r)^{1/β} at the fitted shape)', async () => {
    const all = group(await report({ site: 'KM', from: '2021-01-01', to: '2022-01-01' }), 'all');
    const times = [100, 150, 184, 200, 215, 250, 300, 365];
    const events = [true, true, false, false, false, false, true, false];
    const direct = fitWeibull(times, events, { confidence: 0.9 });
    expect(all.weibull!.shape).toBeCloseTo(direct.fit!.shape, 9);
    // Lawless ch. 5: at the MLE, η = (Σ_all t^β / r)^{1/β}.
    const beta = all.weibull!.shape;
    expect(all.weibull!.scaleDays).toBeCloseTo((times.reduce((s, x) => s + x ** beta, 0) / 3) ** (1 / beta), 6);
    expect(all.b10Days).toBeCloseTo(all.weibull!.scaleDays * (-Math.log(0.9)) ** (1 / beta), 9);
  });

  it('groups by train, stage, position and model with the keys of docs/design.md §6', async () => {
    const byTrain = await report({ site: 'KM', to: '2022-01-01', groupBy: 'train' });
    expect(byTrain.groups.map((g) => [g.key, g.n, g.events])).toEqual([
      ['train=T1', 5, 2],
      ['train=T2', 3, 1],
    ]);
    // T1: 100 E, 184 C, 200 C, 300 E, 365 C → S = 4/5 = 0.8, then × 1/2 = 0.4.
    expect(group(byTrain, 'train=T1').km.filter((p) => (p.nEvents ?? 0) > 0).map((p) => p.survival)).toEqual([
      expect.closeTo(0.8, 12),
      expect.closeTo(0.4, 12),
    ]);
    const byStage = await report({ site: 'KM', to: '2022-01-01', groupBy: 'stage' });
    expect(byStage.groups.map((g) => g.key)).toEqual(['stage=T1-S1', 'stage=T2-S1']);
    const byModel = await report({ site: 'KM', to: '2022-01-01', groupBy: 'model' });
    expect(byModel.groups.map((g) => [g.key, g.n])).toEqual([
      ['model=MX-400', 6],
      ['model=MX-440', 2],
    ]);
    const byPosition = await report({ site: 'KM', to: '2022-01-01', groupBy: 'position' });
    expect(byPosition.groups.map((g) => [g.key, g.n, g.events])).toEqual([
      ['position=1', 3, 2],
      ['position=2', 2, 0],
      ['position=3', 1, 1],
      ['position=4', 1, 0],
      ['position=5', 1, 0],
    ]);
  });

  it('says why a group has no fit: all censored, or one event at the longest age; never NaN', async () => {
    const byPosition = await report({ site: 'KM', to: '2022-01-01', groupBy: 'position' });
    const censored = group(byPosition, 'position=2');
    expect(censored.weibull).toBeNull();
    expect(censored.reasons).toMatchObject({ weibull: 'no-events', b10Days: 'no-events', kmMedianDays: 'not-reached' });
    expect(censored.km.map((p) => p.survival)).toEqual([1, 1]);
    expect(censored.kmMedianDays).toBeNull();
    const single = group(byPosition, 'position=3');
    expect(single.weibull).toBeNull();
    expect(single.reasons).toMatchObject({ weibull: 'shape-diverges', medianRankRegression: 'too-few-events' });
    expect(JSON.stringify(byPosition)).not.toMatch(/NaN|Infinity/);
  });

  it('limits the lives to the asset scope and to the lives overlapping the window', async () => {
    const t2 = await report({ site: 'KM', asset: 'T2', to: '2022-01-01' });
    expect([group(t2, 'all').n, group(t2, 'all').events]).toEqual([3, 1]);
    // Window [2021-06-01, 2022-01-01) = days [151, 365): A1 (removed day 100) and B1 (day 150) ended
    // before it and are left out; D1 was installed after it. C1 (installed day 181) is seen from
    // installation; A2, A3, A4, B2 (installed day 0) enter at age 151, B3 (installed day 150) at age 1.
    //   life | entry | exit | event       risk set at t: entry < t ≤ exit (hand-worked)
    //   C1   |   0   | 184  | C (removed after the window)     t=184: 6 · 200: 5 · 215: 4 · 250: 3
    //   A2   |  151  | 200  | C (planned)                      t=300: 2, one event → S = 1/2
    //   B3   |   1   | 215  | C (in service at the end)        t=365: 1
    //   B2   |  151  | 250  | C (relocated)
    //   A3   |  151  | 300  | E (performance)
    //   A4   |  151  | 365  | C (in service at the end)
    const late = await report({ site: 'KM', from: '2021-06-01', to: '2022-01-01' });
    const lateAll = group(late, 'all');
    expect([lateAll.n, lateAll.events, lateAll.enteredLate]).toEqual([6, 1, 5]);
    expect(lateAll.km.map((p) => [Math.round(p.tDays * 1e6) / 1e6, p.nRisk, p.nEvents, p.nCensored])).toEqual([
      [184, 6, 0, 1],
      [200, 5, 0, 1],
      [215, 4, 0, 1],
      [250, 3, 0, 1],
      [300, 2, 1, 0],
      [365, 1, 0, 1],
    ]);
    expect(lateAll.km[4]!.survival).toBeCloseTo(0.5, 12);
    // S = 0.5 exactly from 300 to the last time 365: the survfit midpoint rule gives 332.5.
    expect(lateAll.kmMedianDays).toBeCloseTo(332.5, 9);
    expect(late.windowTreatment).toMatchObject({ enteredLate: 5, censoredAtEnd: 3 });
    expect(late.notes![0]).toBe(late.windowTreatment!.text);
    expect(late.windowTreatment!.text).toMatch(/5 lives began before the window's start and enter at their age then/);
    // The Weibull fit is the left-truncated one of exactly these lives.
    const direct = fitWeibull([184, 200, 215, 250, 300, 365], [false, false, false, false, true, false], {
      entries: [0, 151, 1, 151, 151, 151],
      confidence: 0.9,
    });
    expect(lateAll.weibull!.shape).toBeCloseTo(direct.fit!.shape, 9);
    expect(lateAll.weibull!.scaleDays).toBeCloseTo(direct.fit!.scale, 6);
    // Median ranks have no delayed-entry form: only C1 was seen from installation, too few events.
    expect(lateAll.medianRankRegression).toBeNull();
    expect(lateAll.reasons).toMatchObject({ medianRankRegression: 'too-few-events' });
    expect(late.provenance!.elements).toEqual(['A2', 'A3', 'A4', 'B2', 'B3', 'C1']);
    // Window ending 2021-06-01 (day 151): A1 and B1 failed before it; A2–A4, B2 are censored at 151, B3 at 1.
    const early = await report({ site: 'KM', to: '2021-06-01T00:00:00Z' });
    const all = group(early, 'all');
    expect([all.n, all.events]).toEqual([7, 2]);
    expect(all.km.map((p) => [p.tDays, p.nEvents, p.nCensored])).toEqual([
      [1, 0, 1],
      [100, 1, 0],
      [150, 1, 0],
      [151, 0, 4],
    ]);
  });

  it('a pump has no elements: an empty all group, not an error', async () => {
    const r = await report({ site: 'KM', asset: 'T1-HPP' });
    expect(r.groups).toHaveLength(1);
    expect(group(r, 'all')).toMatchObject({ n: 0, events: 0, weibull: null, km: [], reasons: { weibull: 'no-data' } });
  });
});

describe('element life: edge cases', () => {
  it('all failed at the same age: KM falls to 0 there, the Weibull shape diverges (null with the reason)', async () => {
    const all = group(await report({ site: 'SAME', to: '2022-01-01' }), 'all');
    expect([all.n, all.events]).toEqual([3, 3]);
    expect(all.km).toEqual([{ tDays: 200, survival: 0, nRisk: 3, nEvents: 3, nCensored: 0, se: null, lower: null, upper: null }]);
    expect(all.kmMedianDays).toBe(200);
    expect(all.weibull).toBeNull();
    expect([all.b10Days, all.medianDays, all.meanDays]).toEqual([null, null, null]);
    expect(all.reasons).toMatchObject({ weibull: 'shape-diverges', medianRankRegression: 'too-few-events' });
  });

  it('no elements: the all group with n = 0 and reasons; other groupings list no group', async () => {
    const all = await report({ site: 'EMPTY' });
    expect(all.groups).toEqual([
      expect.objectContaining({ key: 'all', n: 0, events: 0, weibull: null, b10Days: null, km: [], reasons: expect.objectContaining({ weibull: 'no-data' }) }),
    ]);
    expect(all.from).toBeNull();
    expect((await report({ site: 'EMPTY', groupBy: 'position' })).groups).toEqual([]);
  });

  it('a window before any install gives n = 0; one with lives but no removals has no fit; an empty window is refused', async () => {
    expect(group(await report({ site: 'KM', from: '2020-01-01', to: '2020-06-01' }), 'all')).toMatchObject({ n: 0, weibull: null });
    // [2023-01-01, 2023-02-01): A4, B3 and D1 are in service through it, entering at ages 730, 580
    // and 306 days and censored 31 days later (hand-worked); nothing ends in it.
    const r = await report({ site: 'KM', from: '2023-01-01', to: '2023-02-01' });
    const all = group(r, 'all');
    expect(all).toMatchObject({ n: 3, events: 0, enteredLate: 3, weibull: null, reasons: { weibull: 'no-events' } });
    expect(all.km.map((p) => [Math.round(p.tDays * 1e6) / 1e6, p.nRisk])).toEqual([
      [337, 1],
      [611, 1],
      [761, 1],
    ]);
    expect(r.windowTreatment).toMatchObject({ enteredLate: 3, censoredAtEnd: 3 });
    await expect(report({ site: 'KM', from: '2022-01-01', to: '2021-01-01' })).rejects.toMatchObject({ status: 400, code: 'invalid-window' });
    await expect(report({ site: 'KM', asset: 'NOPE' })).rejects.toBeInstanceOf(HttpError);
  });
});
