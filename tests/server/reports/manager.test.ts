// The manager workbook of the invented operations plant (tests/fixtures/ops-plant.ts), downloaded as the
// manager role and checked against the API's answers for the same site and window, and against figures
// worked by hand from the fixture.
import request from 'supertest';
import type ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ZodType, z } from 'zod';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { binaryBody, numberOf, openWorkbook, rowStartingWith, sameCents } from '../../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

const query = `site=${SITE}&from=2024-12-01&to=2025-02-01`;

let t: TestApp;
let wb: ExcelJS.Workbook;

async function api<S extends ZodType>(path: string, schema: S, extra = ''): Promise<z.infer<S>> {
  const res = await request(t.app).get(`${path}?${query}${extra}`).set('Cookie', t.cookies.manager);
  expect(res.status, path).toBe(200);
  return schema.parse(res.body);
}

beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
  const res = await request(t.app).get(`/api/reports/manager.xlsx?${query}`).set('Cookie', t.cookies.manager).buffer(true).parse(binaryBody);
  expect(res.status).toBe(200);
  wb = await openWorkbook(res.body as Buffer);
});
afterAll(() => t.close());

const sheet = (name: string) => wb.getWorksheet(name)!;
const texts = (ws: ExcelJS.Worksheet) => ws.getSheetValues().flat().filter((v): v is string => typeof v === 'string');

describe('the manager workbook', () => {
  it('holds the cover, the period’s KPIs and their definitions', () => {
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Cover', 'Reliability', 'Downtime by cause', 'Time to complete', 'Membrane alerts', 'Membrane stages', 'Definitions']);
  });

  it('gives availability, MTBF with its bounds and MTTR for the site and each asset as the reliability answer does', async () => {
    const r = await api('/api/kpi/reliability', reliabilityReportSchema, '&groupBy=asset');
    const ws = sheet('Reliability');
    expect(ws.getRow(1).getCell(5).value).toBe('MTBF, lower bound (h)');
    const site = ws.getRow(2);
    expect(site.getCell(1).value).toBe('Site OPS');
    // By hand from the fixture: WO-9, WO-1, WO-6 and WO-2 are corrective with a failure code and reported in
    // the window; WO-3 is cancelled and WO-5 has no failure code (docs/design.md §6, Failure).
    expect(r.failures).toBe(4);
    const cols: [number, number | null | undefined][] = [
      [2, r.operatingHours],
      [3, r.failures],
      [4, r.mtbfHours],
      [5, r.mtbfLowerHours],
      [6, r.mtbfUpperHours],
      [7, r.mttrHours],
      [9, r.availability],
      [10, r.operationalAvailability],
    ];
    for (const [c, v] of cols) expect(numberOf(site.getCell(c)), `column ${c}`).toBeCloseTo(v!, 9);
    expect(site.getCell(9).numFmt).toBe('0.0%');
    const groups = r.groups ?? [];
    expect(groups.length).toBeGreaterThan(0);
    groups.forEach((g, i) => {
      const row = ws.getRow(i + 3);
      expect(row.getCell(1).value).toBe(g.asset);
      expect(numberOf(row.getCell(3))).toBe(g.failures);
      if (g.mtbfHours === null) expect(row.getCell(4).value).toBeNull();
      else expect(numberOf(row.getCell(4))).toBeCloseTo(g.mtbfHours, 9);
    });
  });

  it('gives downtime by cause as the downtime answer’s Pareto table, totalled by SUM to the plant row', async () => {
    const d = await api('/api/kpi/downtime', downtimeReportSchema);
    const ws = sheet('Downtime by cause');
    expect(d.paretoByCause.map((p, i) => ws.getRow(i + 2).getCell(1).value)).toEqual(d.paretoByCause.map((p) => p.key));
    // By hand: TR1's 12 h stop on Jan 3 overlaps the out-of-service window of WO-1, a seal leak.
    const seal = rowStartingWith(ws, 'SEAL-LEAK');
    expect(numberOf(seal.getCell(3))).toBeCloseTo(12, 9);
    const total = rowStartingWith(ws, 'Total');
    expect((total.getCell(3).value as { formula: string }).formula).toBe(`SUM(C2:C${d.paretoByCause.length + 1})`);
    expect(numberOf(total.getCell(3))).toBeCloseTo(d.plant.hours, 9);
    expect(sameCents(numberOf(total.getCell(7)), d.plant.cost)).toBe(true);
  });

  it('gives time to complete by group and the membrane alerts of the performance answer, with their cautions', async () => {
    const ttc = await api('/api/kpi/time-to-complete', timeToCompleteReportSchema);
    const ws = sheet('Time to complete');
    ttc.groups.forEach((g, i) => {
      expect(ws.getRow(i + 2).getCell(1).value).toBe(g.key);
      expect(numberOf(ws.getRow(i + 2).getCell(2))).toBe(g.n);
    });
    const perf = await api('/api/kpi/performance', performanceReportSchema);
    const alerts = perf.stages.flatMap((s) => s.alerts.map((a) => ({ stage: s.asset, ...a })));
    const al = sheet('Membrane alerts');
    alerts.forEach((a, i) => {
      const row = al.getRow(i + 2);
      expect([row.getCell(1).value, row.getCell(3).value]).toEqual([a.stage, a.kind]);
      expect(numberOf(row.getCell(6))).toBeCloseTo(a.changePct, 9);
    });
    for (const caution of new Set(alerts.flatMap((a) => a.cautions))) expect(texts(al)).toContain(caution);
    const stages = sheet('Membrane stages');
    expect(perf.stages.map((s, i) => stages.getRow(i + 2).getCell(1).value)).toEqual(perf.stages.map((s) => s.asset));
  });

  it('says what each KPI is, its unit and its source', () => {
    const ws = sheet('Definitions');
    const kpis = texts(ws);
    for (const name of ['Failure', 'MTBF and its bounds', 'MTTR', 'Availability', 'Downtime, cause, lost volume and cost', 'Time to complete', 'Membrane alerts']) expect(kpis).toContain(name);
    const mtbf = rowStartingWith(ws, 'MTBF and its bounds');
    expect(mtbf.getCell(4).value).toBe('NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1');
    expect(mtbf.getCell(5).value).toBe('GET /api/kpi/reliability');
  });
});
