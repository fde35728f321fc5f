// The finance workbook of the invented operations plant (tests/fixtures/ops-plant.ts), downloaded as the
// finance role, opened with exceljs and checked cell by cell against the API's answers for the same site
// and window — money to the cent — and against figures worked by hand from the fixture.
import request from 'supertest';
import type ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ZodType, z } from 'zod';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { settingsDefaults } from '#shared/schemas/settings.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { binaryBody, numberOf, openWorkbook, rowStartingWith, sameCents } from '../../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

const window = { site: SITE, from: '2024-12-01', to: '2025-02-01' };
const query = `site=${window.site}&from=${window.from}&to=${window.to}`;

let t: TestApp;
let wb: ExcelJS.Workbook;
let headers: Record<string, string>;

async function api<S extends ZodType>(path: string, schema: S): Promise<z.infer<S>> {
  const res = await request(t.app).get(`${path}?${query}`).set('Cookie', t.cookies.finance);
  expect(res.status, path).toBe(200);
  return schema.parse(res.body);
}

beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
  const res = await request(t.app).get(`/api/reports/finance.xlsx?${query}`).set('Cookie', t.cookies.finance).buffer(true).parse(binaryBody);
  expect(res.status, String(res.body)).toBe(200);
  headers = res.headers as Record<string, string>;
  wb = await openWorkbook(res.body as Buffer);
});
afterAll(() => t.close());

const sheet = (name: string) => {
  const ws = wb.getWorksheet(name);
  if (!ws) throw new Error(`no sheet ${name}`);
  return ws;
};
const formulaOf = (cell: ExcelJS.Cell) => (cell.value && typeof cell.value === 'object' && 'formula' in cell.value ? cell.value.formula : null);

describe('the finance workbook', () => {
  it('downloads as an XLSX named after the workbook, site and window', () => {
    expect(headers['content-type']).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expect(headers['content-disposition']).toBe('attachment; filename="finance-OPS-2024-12-01-2025-02-01.xlsx"');
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Cover', 'Summary', 'Maintenance cost', 'Downtime cost', 'Element replacements', 'Replacement budget']);
  });

  it('says on the cover which site and window it is about and how new its data is (the answers’ dataAsOf)', async () => {
    const mix = await api('/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    const cover = sheet('Cover');
    const value = (item: string) => String(rowStartingWith(cover, item).getCell(2).value);
    expect(value('Site')).toBe('OPS');
    expect(value('Window from')).toBe('2024-12-01 00:00 (2024-12-01T00:00:00.000Z), included');
    expect(value('Window to')).toBe('2025-02-01 00:00 (2025-02-01T00:00:00.000Z), not included');
    expect(value('Newest sample used')).toBe(`${mix.dataAsOf.newestSampleAt!.slice(0, 16).replace('T', ' ')} UTC (${mix.dataAsOf.newestSampleAt})`);
    expect(value('Newest work order used')).toContain(`(${mix.dataAsOf.newestWorkOrderAt})`);
    expect(value('Currency')).toBe(settingsDefaults.currency);
    expect(value('Generated at')).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC \(/);
  });

  it('sums maintenance cost by month, asset and type with SUM formulas whose results are the maintenance-mix answer, to the cent', async () => {
    const mix = await api('/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    const ws = sheet('Maintenance cost');
    expect(ws.getRow(1).values).toEqual([undefined, 'Month (completed)', 'Asset', 'Asset name', 'Work-order type', 'Work orders', 'Labour (h)', 'Labour cost (EUR)', 'Parts cost (EUR)', 'Total cost (EUR)']);
    // Hand-worked from the fixture's work orders: closed orders completed in the window, grouped.
    const rows = [2, 3, 4, 5, 6, 7].map((r) => ws.getRow(r)).map((row) => [1, 2, 4, 5, 6, 7, 8].map((c) => row.getCell(c).value));
    expect(rows).toEqual([
      ['2024-12', 'TR1-HPP', 'corrective', 1, 4, 200, 100],
      ['2025-01', 'TR1-HPP', 'corrective', 2, 12, 600, 170],
      ['2025-01', 'TR1-S1', 'preventive', 1, 6, 300, 0],
      ['2025-01', 'TR1-S2', 'preventive', 1, 6, 300, 200],
      ['2025-01', 'TR2', 'preventive', 1, 6, 300, 0],
      ['2025-01', 'TR2-P1', 'corrective', 1, 8, 400, 300],
    ]);
    expect(formulaOf(ws.getCell('I2'))).toBe('G2+H2');
    const total = rowStartingWith(ws, 'Total');
    expect(total.number).toBe(8);
    expect([5, 6, 7, 8, 9].map((c) => formulaOf(total.getCell(c)))).toEqual(['SUM(E2:E7)', 'SUM(F2:F7)', 'SUM(G2:G7)', 'SUM(H2:H7)', 'SUM(I2:I7)']);
    expect(numberOf(total.getCell(5))).toBe(mix.labour.workOrders.length);
    expect(numberOf(total.getCell(6))).toBeCloseTo(mix.labour.totalHours, 9);
    expect(sameCents(numberOf(total.getCell(7)), mix.cost.labourCost)).toBe(true);
    expect(sameCents(numberOf(total.getCell(8)), mix.cost.partsCost)).toBe(true);
    expect(sameCents(numberOf(total.getCell(9)), mix.cost.totalCost)).toBe(true);
    // The same totals by hand: labour 200 + 600 + 300 + 300 + 300 + 400, parts 100 + 170 + 200 + 300.
    expect(mix.cost.labourCost).toBe(2100);
    expect(mix.cost.partsCost).toBe(770);
    // Cost per m³: train TR2 has no permeate-flow tag, so the volume produced (and the cost per m³) is not
    // known; the sheet says so with the answer's reason instead of a number.
    expect(mix.cost.costPerM3).toBeNull();
    expect(rowStartingWith(ws, 'Permeate produced in the window (m³)').getCell(9).value).toBe('not known');
    expect(rowStartingWith(ws, 'Maintenance cost per m³ produced (EUR/m³)').getCell(9).value).toBe('not known');
    expect(ws.getSheetValues().flat()).toContain(`Cost per m³: ${mix.cost.reason}`);
  });

  it('gives downtime cost by asset as the downtime answer has it, with a SUM total equal to the plant row', async () => {
    const downtime = await api('/api/kpi/downtime', downtimeReportSchema);
    const ws = sheet('Downtime cost');
    expect(ws.getCell('G1').value).toBe('Cost (EUR)');
    const lines = downtime.totals.map((_, i) => ws.getRow(i + 2));
    expect(lines.map((r) => r.getCell(1).value)).toEqual(downtime.totals.map((d) => d.asset));
    lines.forEach((r, i) => expect(sameCents(numberOf(r.getCell(7)), downtime.totals[i]!.cost)).toBe(true));
    const total = rowStartingWith(ws, 'Total');
    expect(formulaOf(total.getCell(7))).toBe(`SUM(G2:G${downtime.totals.length + 1})`);
    expect(sameCents(numberOf(total.getCell(7)), downtime.plant.cost)).toBe(true);
    expect(numberOf(total.getCell(3))).toBeCloseTo(downtime.plant.hours, 9);
    // By hand: TR1 stopped 12 h + 8 h at 100 m³/h rated, TR2-P1 10 h + 4 h (to the end of the data) priced at
    // its train's 50 m³/h; each m³ at the default water value of 0.85 EUR: 2000 × 0.85 + 700 × 0.85 = 2295.
    expect(downtime.plant.cost).toBeCloseTo((2000 + 700) * settingsDefaults.waterValuePerM3, 9);
  });

  it('lists the element replaced in the window with its cost, and counts the life-ending removals as element life does', async () => {
    const life = await api('/api/kpi/element-life', elementLifeReportSchema);
    const ws = sheet('Element replacements');
    const row = ws.getRow(2);
    // The fixture: A-001 (position 1 of TR1-S1-V01) failed on 2025-01-04 10:00 and A-007 took its place.
    expect([1, 4, 5, 6, 10, 11, 12].map((c) => row.getCell(c).value)).toEqual([new Date('2025-01-04T10:00:00Z'), 'TR1-S1-V01', 1, 'A-001', 'failed', 'yes', 'A-007']);
    expect(row.getCell(14).value).toBe(settingsDefaults.elementUnitCost);
    const total = rowStartingWith(ws, 'Total');
    expect(formulaOf(total.getCell(11))).toBe('COUNTIF(K2:K2,"yes")');
    expect(numberOf(total.getCell(11))).toBe(life.groups.find((g) => g.key === 'all')!.events);
    expect(formulaOf(total.getCell(14))).toBe('SUM(N2:N2)');
    expect(numberOf(total.getCell(14))).toBe(settingsDefaults.elementUnitCost);
  });

  it('gives the replacement budget month by month with the band, totalled by SUM to the forecast answer', async () => {
    const forecast = await api('/api/kpi/forecast', forecastReportSchema);
    const ws = sheet('Replacement budget');
    const all = forecast.groups.find((g) => g.key === 'all');
    const months = all ? all.months : forecast.totals;
    expect(months.length).toBeGreaterThanOrEqual(12);
    months.forEach((m, i) => {
      const r = ws.getRow(i + 2);
      expect(r.getCell(1).value).toBe(m.label);
      expect(numberOf(r.getCell(5))).toBeCloseTo(m.expectedCount, 12);
      expect(sameCents(numberOf(r.getCell(8)), m.expectedCost)).toBe(true);
    });
    const total = rowStartingWith(ws, 'Total');
    expect(formulaOf(total.getCell(8))).toBe(`SUM(H2:H${months.length + 1})`);
    const expectedCost = all ? all.total.expectedCost : forecast.totals.reduce((s, m) => s + m.expectedCost, 0);
    expect(sameCents(numberOf(total.getCell(8)), expectedCost)).toBe(true);
    if (all) {
      expect(sameCents(numberOf(total.getCell(9)), all.total.costLower)).toBe(true);
      expect(sameCents(numberOf(total.getCell(10)), all.total.costUpper)).toBe(true);
    }
    // Replacing elements opens pressure vessels: the forecast's cautions come with the budget (docs/design.md §9).
    const texts = ws.getSheetValues().flat().filter((v): v is string => typeof v === 'string');
    for (const caution of forecast.cautions ?? []) expect(texts).toContain(caution);
    expect((forecast.cautions ?? []).length).toBeGreaterThan(0);
  });

  it('sums up on the Summary sheet with formulas pointing at each total', async () => {
    const mix = await api('/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    const downtime = await api('/api/kpi/downtime', downtimeReportSchema);
    const ws = sheet('Summary');
    const total = rowStartingWith(ws, 'Maintenance cost, labour + parts');
    expect(formulaOf(total.getCell(2))).toBe("'Maintenance cost'!I8");
    expect(sameCents(numberOf(total.getCell(2)), mix.cost.totalCost)).toBe(true);
    const dt = rowStartingWith(ws, 'Downtime cost (lost permeate at the water value)');
    expect(formulaOf(dt.getCell(2))).toBe(`'Downtime cost'!G${downtime.totals.length + 2}`);
    expect(sameCents(numberOf(dt.getCell(2)), downtime.plant.cost)).toBe(true);
  });

  it('freezes and filters the header of each table, with widths and number formats per column', () => {
    for (const name of ['Summary', 'Maintenance cost', 'Downtime cost', 'Element replacements', 'Replacement budget']) {
      const ws = sheet(name);
      expect(ws.views[0], name).toMatchObject({ state: 'frozen', ySplit: 1 });
      expect(ws.autoFilter, name).toBeTruthy();
      expect(ws.getColumn(1).width, name).toBeGreaterThan(5);
      expect(ws.getRow(1).getCell(1).font?.bold, name).toBe(true);
    }
    expect(sheet('Maintenance cost').autoFilter).toBe('A1:I7');
    expect(sheet('Maintenance cost').getCell('G2').numFmt).toBe('#,##0.00');
    expect(sheet('Element replacements').getCell('A2').numFmt).toBe('yyyy-mm-dd hh:mm');
  });
});
