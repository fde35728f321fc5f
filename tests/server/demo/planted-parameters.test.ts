// On the seeded demo plant, the KPI engine recovers what the generator planted: each stage's element
// Weibull shape and scale, and each pump's failure rate, lie inside the engine's own 90 % intervals.
// The planted values come from the generator's manifest (server/demo/plant.ts), not from this test.
// On the same plant: the benchmark's hand-written SQL floors (bench/kpi-floors.ts) answer the same
// questions as the engine, so `npm run bench:kpi` compares like with like.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { forecastReplacements } from '#shared/kpi/forecast.ts';
import { elementLifeQuerySchema } from '#shared/schemas/element-life.ts';
import { forecastQuerySchema } from '#shared/schemas/forecast.ts';
import { reliabilityQuerySchema } from '#shared/schemas/reliability.ts';
import { timeToCompleteQuerySchema } from '#shared/schemas/time-to-complete.ts';
import { seedDemo, type SeedResult } from '#server/demo/seed.ts';
import { getElementLife } from '#server/services/element-life.ts';
import { getForecast } from '#server/services/forecast.ts';
import { getReliability } from '#server/services/reliability.ts';
import { getSettings } from '#server/services/settings.ts';
import { getTimeToComplete } from '#server/services/time-to-complete.ts';
import { kpiFloors } from '../../../bench/kpi-floors.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';

let t: TestDatabase;
let seeded: SeedResult;

beforeAll(async () => {
  t = await createTestDatabase();
  // Three years at hourly steps: the element register is the full one (it does not depend on the
  // historian's resolution) and pump failures over three years give each rate some power.
  seeded = await seedDemo(t.db, { outDir: mkdtempSync(join(tmpdir(), 'osmia-planted-')), years: 3, stepMinutes: 60 });
}, 300_000);
afterAll(() => t.close());

describe('planted parameters of the demo plant', () => {
  it('each stage’s Weibull shape and scale lie inside the engine’s 90 % intervals', async () => {
    const report = await getElementLife(t.db, elementLifeQuerySchema.parse({ groupBy: 'stage', confidence: 0.9 }));
    const byStage = seeded.manifest.planted.elementLife.byStage;
    const checked: string[] = [];
    for (const planted of Object.values(byStage)) {
      for (const stage of planted.stages) {
        const group = report.groups.find((g) => g.key === `stage=${stage}`);
        expect(group, `group stage=${stage}`).toBeDefined();
        const w = group!.weibull!;
        expect(w, `fit of ${stage}`).not.toBeNull();
        expect(w.shapeLower!, `${stage} shape lower`).toBeLessThanOrEqual(planted.shape);
        expect(w.shapeUpper!, `${stage} shape upper`).toBeGreaterThanOrEqual(planted.shape);
        expect(w.scaleLowerDays!, `${stage} scale lower`).toBeLessThanOrEqual(planted.scaleDays);
        expect(w.scaleUpperDays!, `${stage} scale upper`).toBeGreaterThanOrEqual(planted.scaleDays);
        checked.push(stage);
      }
    }
    expect(checked.sort()).toEqual(['T1-S1', 'T1-S2', 'T2-S1', 'T2-S2']);
  });

  it('each pump’s planted MTBF lies inside the engine’s 90 % two-sided interval', async () => {
    const historian = seeded.manifest.historian;
    for (const pump of seeded.manifest.planted.pumps) {
      const r = await getReliability(t.db, reliabilityQuerySchema.parse({ asset: pump.asset, from: historian.start, to: historian.end, confidence: 0.9 }));
      expect(r.operatingTimeSource, pump.asset).toBe('run-status');
      expect(r.failures, `${pump.asset} failures`).toBeGreaterThan(0);
      expect(r.mtbfLowerHours!, `${pump.asset} lower`).toBeLessThanOrEqual(pump.mtbfHours);
      expect(r.mtbfUpperHours!, `${pump.asset} upper`).toBeGreaterThanOrEqual(pump.mtbfHours);
    }
  });
});

describe('benchmark floors answer the engine’s questions', () => {
  async function floors() {
    const site = (await t.db.$client.query<{ id: number; time_zone: string }>(`select id, time_zone from sites`)).rows[0]!;
    const settings = await getSettings(t.db);
    return kpiFloors({ siteId: site.id, timeZone: site.time_zone, stepMinutes: 60, elementUnitCost: settings.elementUnitCost });
  }
  const close = (a: number, b: number, tolerance = 1e-9) => Math.abs(a - b) <= tolerance * Math.max(1, Math.abs(b));

  it('element life: the same Kaplan–Meier curve, Greenwood bounds and rank-regression line', async () => {
    const { rows } = await t.db.$client.query<{ t: number; survival: number; n_risk: number; lower: number; upper: number; shape: number; scale: number }>(
      (await floors())['element-life']!,
    );
    const group = (await getElementLife(t.db, elementLifeQuerySchema.parse({}))).groups[0]!;
    expect(rows.length).toBe(group.km.length);
    group.km.forEach((k, i) => {
      expect(close(rows[i]!.t, k.tDays), `t at row ${i}`).toBe(true);
      expect(Number(rows[i]!.n_risk)).toBe(k.nRisk);
      expect(close(rows[i]!.survival, k.survival), `S at row ${i}`).toBe(true);
      if (k.lower != null) expect(close(rows[i]!.lower, k.lower, 1e-7), `lower at row ${i}`).toBe(true);
      if (k.upper != null) expect(close(rows[i]!.upper, k.upper, 1e-7), `upper at row ${i}`).toBe(true);
    });
    expect(close(rows[0]!.shape, group.medianRankRegression!.yOnX.shape)).toBe(true);
    expect(close(rows[0]!.scale, group.medianRankRegression!.yOnX.scaleDays)).toBe(true);
  });

  it('forecast: the same monthly expected replacements for the rank-regression line', async () => {
    const sql = await floors();
    const { rows } = await t.db.$client.query<{ k: number; expected: number }>(sql.forecast!);
    const line = (await t.db.$client.query<{ shape: number; scale: number }>(sql['element-life']!)).rows[0]!;
    const answer = await getForecast(t.db, forecastQuerySchema.parse({}), await getSettings(t.db));
    const asOf = new Date(answer.asOf);
    const elements = (answer.groups[0]!.elements ?? []).map((e) => ({ id: e.serial, ageDays: e.ageDays, replacementCost: 1 }));
    expect(elements.length).toBe(answer.inService); // every element listed (fewer than the list cap)
    const periods = answer.totals.map((p) => ({ label: p.label, start: new Date(p.from), end: new Date(p.to) }));
    const same = forecastReplacements({ asOf, elements, periods, fit: line });
    expect(rows.map((r) => Number(r.expected))).toHaveLength(same.periods.length);
    same.periods.forEach((p, k) => expect(close(Number(rows[k]!.expected), p.expectedCount, 1e-6), p.label).toBe(true));
  });

  it('time to complete: the same jobs, groups, medians, 90th percentiles and quarterly learning curve', async () => {
    const { rows } = await t.db.$client.query<{ kind: string; guided: string | null; crew: string | null; procedure: string | null; period: string | null; count: number; percentile_cont: number[] }>(
      (await floors())['time-to-complete']!,
    );
    const answer = await getTimeToComplete(t.db, timeToCompleteQuerySchema.parse({}));
    const keyOf = (r: (typeof rows)[number]) =>
      r.guided !== null ? `guided=${r.guided === 'true' ? 'yes' : 'no'}` : r.crew !== null ? `crew=${r.crew}` : r.procedure !== null ? `procedure=${r.procedure}` : 'all';
    const groups = rows.filter((r) => r.kind === 'group');
    expect(groups.map(keyOf).sort()).toEqual(answer.groups.map((g) => g.key).sort());
    for (const g of answer.groups) {
      const r = groups.find((x) => keyOf(x) === g.key)!;
      expect(Number(r.count), g.key).toBe(g.n);
      expect(close(r.percentile_cont[0]!, g.medianHours!), `${g.key} median`).toBe(true);
      expect(close(r.percentile_cont[1]!, g.p90Hours!), `${g.key} p90`).toBe(true);
    }
    const jobs = rows.filter((r) => r.kind === 'job');
    expect(jobs.map((j) => j.period).sort()).toEqual(answer.jobs!.map((j) => j.woNumber).sort());
    const quarters = rows.filter((r) => r.kind === 'quarter').sort((a, b) => (a.period! < b.period! ? -1 : 1));
    const byPeriod = answer.learningCurve!.byPeriod.filter((b) => b.n > 0);
    expect(quarters.map((q) => [q.period, Number(q.count)])).toEqual(byPeriod.map((b) => [b.label, b.n]));
  });
});
