// Element life and forecast with a window in the middle of the data, on the generated demo element
// register, over HTTP: elements installed before the window and in service during it count — the
// survival curve's risk sets hold them from their age at the window's start (delayed entry), and
// the forecast covers every element in service at the window's end. Figures are recounted here
// straight from the generated CSV, not from the service.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fitWeibull } from '#shared/kpi/element-life.ts';
import { elementLifeReportSchema, type ElementLifeReport } from '#shared/schemas/element-life.ts';
import { forecastReportSchema, type ForecastReport } from '#shared/schemas/forecast.ts';
import { generateDemoPlant } from '#server/demo/generate.ts';
import { runImport } from '#server/importers/run.ts';
import { getSettings } from '#server/services/settings.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';

const DAY_MS = 86_400_000;
const lifeEnding = new Set(['failed', 'performance', 'damaged']);

let t: TestApp;
interface RegisterLife {
  serial: string;
  installed: number;
  removed: number | null;
  reason: string;
}
let register: RegisterLife[];
let life: ElementLifeReport;
let forecast: ForecastReport;

beforeAll(async () => {
  t = await createTestApp();
  // The demo element register depends on the seed and the end date only, not on the historian's
  // length or step: one year at daily steps keeps the generation short.
  const dir = mkdtempSync(join(tmpdir(), 'osmia-window-'));
  const manifest = await generateDemoPlant({ outDir: dir, years: 1, stepMinutes: 1440 });
  for (const file of ['assets.csv', 'elements.csv']) {
    const kind = file === 'assets.csv' ? 'assets' : 'elements';
    const rec = await runImport(t.db, { kind, path: join(dir, file), site: manifest.site.code, tz: manifest.site.timeZone, actor: 'test' });
    expect(rec.status).toBe('completed');
  }
  const [header, ...lines] = readFileSync(join(dir, 'elements.csv'), 'utf8').trim().split('\n');
  const col = header!.split(',');
  register = lines.map((line) => {
    const f = line.split(',');
    const v = (name: string) => f[col.indexOf(name)]!;
    return { serial: v('serial'), installed: Date.parse(v('installed_at')), removed: v('removed_at') ? Date.parse(v('removed_at')) : null, reason: v('removal_reason') };
  });
  const get = async (url: string) => {
    const res = await request(t.app).get(url).set('Cookie', t.cookies.engineer);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as unknown;
  };
  // A year in the middle of the register (2008–2026), bare dates as a person types them.
  life = elementLifeReportSchema.parse(await get('/api/kpi/element-life?from=2024-03-03&to=2025-03-03'));
  forecast = forecastReportSchema.parse(await get('/api/kpi/forecast?from=2024-03-03&to=2025-03-03'));
}, 120_000);
afterAll(() => t.close());

describe('element life with a window in the middle of the demo register', () => {
  it('uses every life overlapping the window; those begun before it enter late', () => {
    const from = Date.parse(life.from!);
    const to = Date.parse(life.to!);
    const overlapping = register.filter((e) => e.installed < to && (e.installed >= from || e.removed === null || e.removed > from));
    const late = overlapping.filter((e) => e.installed < from);
    const events = overlapping.filter((e) => e.removed !== null && e.removed < to && lifeEnding.has(e.reason));
    const all = life.groups.find((g) => g.key === 'all')!;
    expect([all.n, all.enteredLate, all.events]).toEqual([overlapping.length, late.length, events.length]);
    expect(late.length).toBeGreaterThan(0);
    expect(all.events).toBeGreaterThan(0);
    expect(all.weibull).not.toBeNull();
    expect(life.windowTreatment!.enteredLate).toBe(late.length);
    expect(life.notes).toContain(life.windowTreatment!.text);
  });

  it('counts at small ages the lives installed before the window that had entered by then', () => {
    const from = Date.parse(life.from!);
    const to = Date.parse(life.to!);
    const all = life.groups.find((g) => g.key === 'all')!;
    const small = all.km.filter((p) => p.tDays <= 120);
    expect(small.length).toBeGreaterThan(3);
    let includesLate = false;
    for (const row of small) {
      // Recount from the CSV: entry < t ≤ exit, entry = age at `from` for a life begun before it.
      let atRisk = 0;
      let installedInWindow = 0;
      for (const e of register) {
        if (e.installed >= to || (e.installed < from && e.removed !== null && e.removed <= from)) continue;
        const exit = ((e.removed !== null && e.removed < to ? e.removed : to) - e.installed) / DAY_MS;
        const entry = e.installed < from ? (from - e.installed) / DAY_MS : 0;
        if (row.tDays <= exit + 1e-9 && (entry === 0 || entry < row.tDays)) {
          atRisk += 1;
          if (entry === 0) installedInWindow += 1;
        }
      }
      expect(row.nRisk, `at ${row.tDays} days`).toBe(atRisk);
      if (atRisk > installedInWindow) includesLate = true;
    }
    expect(includesLate).toBe(true);
  });

  it('installed-in-window lives alone have no event (why a cohort rule gave no fit); the window fit has one', () => {
    const from = Date.parse(life.from!);
    const to = Date.parse(life.to!);
    const cohort = register.filter((e) => e.installed >= from && e.installed < to);
    const times = cohort.map((e) => ((e.removed !== null && e.removed < to ? e.removed : to) - e.installed) / DAY_MS);
    const events = cohort.map((e) => e.removed !== null && e.removed < to && lifeEnding.has(e.reason));
    expect(fitWeibull(times, events).reason).toBe('no-events');
    expect(life.groups[0]!.weibull!.shape).toBeGreaterThan(1);
  });
});

describe('forecast with a window in the middle of the demo register', () => {
  it('covers the elements in service at the window’s end, at their age then, with expected replacements > 0', async () => {
    const to = Date.parse(forecast.asOf);
    expect(forecast.asOf).toBe(life.to);
    const inService = register.filter((e) => e.installed < to && (e.removed === null || e.removed >= to));
    expect(inService.length).toBeGreaterThan(0);
    expect(forecast.inService).toBe(inService.length);
    const all = forecast.groups.find((g) => g.key === 'all')!;
    expect(all.inService).toBe(inService.length);
    expect(all.total.expectedCount).toBeGreaterThan(0);
    const { elementUnitCost } = await getSettings(t.db);
    expect(all.total.expectedCost).toBeCloseTo(all.total.expectedCount * elementUnitCost, 6);
    // Ages at the window's end, for elements installed long before the window.
    const oldest = inService.reduce((a, b) => (a.installed <= b.installed ? a : b));
    expect(oldest.installed).toBeLessThan(Date.parse(life.from!));
    const listed = all.elements!.find((e) => e.serial === oldest.serial)!;
    expect(listed.ageDays).toBeCloseTo((to - oldest.installed) / DAY_MS, 9);
    // The horizon starts at the window's end.
    expect(forecast.totals[0]!.from).toBe(forecast.asOf);
    // The fit of the forecast is element life's for the same window.
    expect(all.weibull!.shape).toBeCloseTo(life.groups[0]!.weibull!.shape, 12);
    expect(forecast.windowTreatment).toMatchObject({ enteredLate: life.windowTreatment!.enteredLate, censoredAtEnd: life.windowTreatment!.censoredAtEnd });
    expect(forecast.notes).toContain(forecast.windowTreatment!.text);
  });
});
