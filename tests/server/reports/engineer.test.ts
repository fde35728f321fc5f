// The engineer workbook of the invented operations plant (tests/fixtures/ops-plant.ts), downloaded as the
// engineer role: the element register against the fixture's installs and the forecast answer, the failure
// list against the reliability answer, the import history against the imports the fixture made.
import request from 'supertest';
import type ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { importHistorySchema } from '#shared/schemas/imports.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { binaryBody, numberOf, openWorkbook, rowStartingWith } from '../../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

const query = `site=${SITE}&from=2024-12-01&to=2025-02-01`;
const DAY = 86_400_000;

let t: TestApp;
let wb: ExcelJS.Workbook;

beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
  const res = await request(t.app).get(`/api/reports/engineer.xlsx?${query}`).set('Cookie', t.cookies.engineer).buffer(true).parse(binaryBody);
  expect(res.status).toBe(200);
  wb = await openWorkbook(res.body as Buffer);
});
afterAll(() => t.close());

const sheet = (name: string) => wb.getWorksheet(name)!;

describe('the engineer workbook', () => {
  it('lists every element install the window sees, with its age and the forecast’s risk', async () => {
    const res = await request(t.app).get(`/api/kpi/forecast?${query}`).set('Cookie', t.cookies.engineer);
    const forecast = forecastReportSchema.parse(res.body);
    const ws = sheet('Element register');
    expect(ws.getRow(1).getCell(13).value).toBe('Risk, next 12 months (%)');
    const rows = Array.from({ length: ws.rowCount - 1 }, (_, i) => ws.getRow(i + 2)).filter((r) => /^[AB]-\d{3}$/.test(String(r.getCell(1).value)));
    // The fixture: six elements in each of two vessels, and A-007 in place of A-001 from Jan 4.
    expect(rows).toHaveLength(13);
    const a001 = rows.find((r) => r.getCell(1).value === 'A-001')!;
    expect([a001.getCell(9).value, a001.getCell(10).value, a001.getCell(11).value]).toEqual(['failed', 'yes', 'no']);
    // Installed 2024-12-31 12:00, removed 2025-01-04 10:00: 3 days 22 hours.
    expect(numberOf(a001.getCell(12))).toBeCloseTo(3 + 22 / 24, 9);
    expect(a001.getCell(13).value).toBeNull();
    const b001 = rows.find((r) => r.getCell(1).value === 'B-001')!;
    // In service at the window's end, 2025-02-01 00:00 UTC; installed 2025-01-01 02:00.
    expect(numberOf(b001.getCell(12))).toBeCloseTo((Date.parse('2025-02-01T00:00:00Z') - Date.parse('2025-01-01T02:00:00Z')) / DAY, 9);
    const risks = new Map((forecast.groups.find((g) => g.key === 'all')?.elements ?? []).map((e) => [e.serial, e.probability]));
    for (const r of rows.filter((x) => x.getCell(11).value === 'yes')) {
      const expected = risks.get(String(r.getCell(1).value));
      if (expected === undefined) expect(r.getCell(13).value).toBeNull();
      else expect(numberOf(r.getCell(13))).toBeCloseTo(expected, 12);
    }
    expect(ws.getRow(2).getCell(7).numFmt).toBe('yyyy-mm-dd hh:mm');
    expect(ws.autoFilter).toBe('A1:M14');
  });

  it('lists the failures the reliability answer counts, in the order they were reported', async () => {
    const res = await request(t.app).get(`/api/kpi/reliability?${query}`).set('Cookie', t.cookies.engineer);
    const reliability = reliabilityReportSchema.parse(res.body);
    const ws = sheet('Failures');
    const numbers = Array.from({ length: reliability.failures }, (_, i) => ws.getRow(i + 2).getCell(1).value);
    expect(numbers).toEqual(['WO-9', 'WO-1', 'WO-6', 'WO-2']);
    const total = rowStartingWith(ws, 'Total');
    expect((total.getCell(2).value as { formula: string }).formula).toBe('COUNTA(A2:A5)');
    expect(numberOf(total.getCell(2))).toBe(reliability.failures);
    expect(ws.getRow(2).getCell(17).value).toBe('Earlier seal leak');
    // WO-1 was out of service 06:00–18:00.
    expect(numberOf(ws.getRow(3).getCell(12))).toBe(12);
  });

  it('lists the site’s imports newest first, as the import history has them', async () => {
    const res = await request(t.app).get('/api/imports').set('Cookie', t.cookies.engineer);
    const history = importHistorySchema.parse(res.body).imports.filter((i) => i.site === SITE);
    const ws = sheet('Imports');
    expect(history.map((h, i) => [ws.getRow(i + 2).getCell(1).value, ws.getRow(i + 2).getCell(2).value, ws.getRow(i + 2).getCell(7).value])).toEqual(
      history.map((h) => [h.id, h.kind, h.rowsRead]),
    );
    expect(history.map((h) => h.kind)).toEqual(['elements', 'work-orders', 'historian', 'tags', 'assets']);
    expect(sheet('Import rejects').getSheetValues().flat()).toContain('No import of the site rejected a row.');
  });
});
