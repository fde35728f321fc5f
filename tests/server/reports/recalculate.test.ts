// The three workbooks of the invented demo plant (the generator, one year at hourly steps), written by
// writeReport, then recalculated by a real spreadsheet engine: LibreOffice opens each file, recomputes
// every formula and saves each sheet as CSV. The recomputed totals must equal the cached results exceljs
// reads and the API's answers for the same site and window (money to the cent).
import { createWriteStream, mkdtempSync, rmSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import type ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ZodType, z } from 'zod';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import type { ReportName } from '#shared/schemas/reports.ts';
import { seedDemo } from '#server/demo/seed.ts';
import { Book, Formula } from '#server/reports/book.ts';
import { writeReport } from '#server/reports/index.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { numberOf, openWorkbook, recalculate, rowStartingWith, sameCents, soffice } from '../../setup/spreadsheet.ts';

let t: TestApp;
let demoDir: string;
let outDir: string;
let site: string;
let window: { from: string; to: string };
const files = {} as Record<ReportName, string>;
const books = {} as Record<ReportName, ExcelJS.Workbook>;

async function api<S extends ZodType>(path: string, schema: S, extra = ''): Promise<z.infer<S>> {
  const res = await request(t.app).get(`${path}?site=${site}&from=${window.from}&to=${window.to}${extra}`).set('Cookie', t.cookies.admin);
  expect(res.status, path).toBe(200);
  return schema.parse(res.body);
}

beforeAll(async () => {
  t = await createTestApp();
  demoDir = mkdtempSync(join(tmpdir(), 'osmia-demo-reports-'));
  outDir = mkdtempSync(join(tmpdir(), 'osmia-reports-out-'));
  const seeded = await seedDemo(t.db, { outDir: demoDir, years: 1, stepMinutes: 60 });
  site = seeded.manifest.site.code;
  // Whole calendar months inside the generated year: from the 1st after its start to the 1st of its last month.
  const start = new Date(seeded.manifest.options.start);
  const end = new Date(seeded.manifest.options.end);
  const first = (y: number, m: number) => new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 10);
  window = { from: first(start.getUTCFullYear(), start.getUTCMonth() + 1), to: first(end.getUTCFullYear(), end.getUTCMonth()) };
  for (const name of ['finance', 'manager', 'engineer'] as const) {
    const written = await writeReport(t.db, { name, site, ...window }, join(outDir, `${name}.xlsx`));
    files[name] = written.path;
    books[name] = await openWorkbook(await readFile(written.path));
    // The sheets writeReport reports are the sheets in the file, with their rows.
    expect(written.sheets.map((s) => s.name)).toEqual(books[name].worksheets.map((w) => w.name));
    for (const s of written.sheets) expect(books[name].getWorksheet(s.name)!.rowCount, `${name}/${s.name}`).toBe(s.rows);
  }
}, 600_000);
afterAll(async () => {
  await t.close();
  for (const d of [demoDir, outDir]) rmSync(d, { recursive: true, force: true });
});

const formulaOf = (cell: ExcelJS.Cell) => (cell.value && typeof cell.value === 'object' && 'formula' in cell.value ? cell.value.formula : null);

describe('workbooks of the demo plant, as exceljs reads them', () => {
  it('set the cost per m³ produced as a formula over the total and the volume, equal to the maintenance-mix answer', async () => {
    const mix = await api('/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    expect(mix.cost.costPerM3).not.toBeNull();
    const ws = books.finance.getWorksheet('Maintenance cost')!;
    const total = rowStartingWith(ws, 'Total');
    const produced = rowStartingWith(ws, 'Permeate produced in the window (m³)');
    const perM3 = rowStartingWith(ws, 'Maintenance cost per m³ produced (EUR/m³)');
    expect(formulaOf(perM3.getCell(9))).toBe(`I${total.number}/I${produced.number}`);
    expect(numberOf(produced.getCell(9))).toBeCloseTo(mix.cost.producedM3!, 6);
    expect(numberOf(perM3.getCell(9))).toBeCloseTo(mix.cost.costPerM3!, 12);
    expect(sameCents(numberOf(total.getCell(9)), mix.cost.totalCost)).toBe(true);
  });

  it('give the budget of a plant with a Weibull fit, with its band, as the forecast answer has it', async () => {
    const forecast = await api('/api/kpi/forecast', forecastReportSchema);
    const all = forecast.groups.find((g) => g.key === 'all')!;
    expect(all.weibull).not.toBeNull();
    const total = rowStartingWith(books.finance.getWorksheet('Replacement budget')!, 'Total');
    expect(sameCents(numberOf(total.getCell(8)), all.total.expectedCost)).toBe(true);
    expect(sameCents(numberOf(total.getCell(9)), all.total.costLower)).toBe(true);
    expect(sameCents(numberOf(total.getCell(10)), all.total.costUpper)).toBe(true);
    expect(all.total.costLower!).toBeLessThan(all.total.expectedCost);
    // The engineer's register carries each in-service element's probability from the same answer.
    const register = books.engineer.getWorksheet('Element register')!;
    const risk = new Map(all.elements!.map((e) => [e.serial, e.probability]));
    let compared = 0;
    for (let r = 2; r <= register.rowCount; r++) {
      const row = register.getRow(r);
      if (row.getCell(11).value !== 'yes') continue;
      expect(numberOf(row.getCell(13)), String(row.getCell(1).value)).toBeCloseTo(risk.get(String(row.getCell(1).value))!, 12);
      compared++;
    }
    expect(compared).toBe(all.inService);
  });
});

// LibreOffice is installed by `npm test` when it runs as root (tests/run.ts); elsewhere these checks are
// skipped, and say so.
if (!soffice) console.warn('LibreOffice (Debian package libreoffice-calc-nogui) is not installed: the recalculation checks are skipped.');

describe.skipIf(!soffice)('workbooks of the demo plant, recalculated by LibreOffice', () => {
  let sheets: Map<string, Map<string, string[][]>>;
  beforeAll(() => {
    sheets = recalculate(Object.values(files));
  }, 300_000);

  /** The recomputed number in a sheet's row that starts with `label`, column `col` (1-based). */
  const recalculated = (name: ReportName, sheet: string, label: string, col: number) => {
    const rows = sheets.get(files[name])!.get(sheet);
    if (!rows) throw new Error(`LibreOffice wrote no sheet ${sheet} of ${name}`);
    const row = rows.find((r) => r[0] === label);
    if (!row) throw new Error(`no row ${label} in ${name}/${sheet}`);
    return Number(row[col - 1]);
  };
  const cached = (name: ReportName, sheet: string, label: string, col: number) => numberOf(rowStartingWith(books[name].getWorksheet(sheet)!, label).getCell(col));

  it('really recomputes: a formula whose cached result is wrong comes back with the right value', async () => {
    // A control, so the checks below cannot pass on cached results alone: 1.25 + 2.5 is 3.75, not 999.
    const file = join(outDir, 'control.xlsx');
    const out = createWriteStream(file);
    const book = await Book.open(out, 'UTC', new Date());
    const sheet = book.sheet('Control', { table: true, columns: [{ header: 'Item', kind: 'text', width: 10 }, { header: 'Value', kind: 'money', width: 10 }] });
    await sheet.row(['a', 1.25]);
    await sheet.row(['b', 2.5]);
    await sheet.row(['Total', new Formula('SUM(B2:B3)', 999)], 'total');
    book.done(sheet);
    await book.close();
    const again = recalculate([file]).get(file)!.get('Control')!;
    expect(again.find((r) => r[0] === 'Total')?.[1]).toBe('3.75');
  });

  it('recomputes the maintenance cost totals and cost per m³ to the API’s figures', async () => {
    const mix = await api('/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    for (const [col, value] of [
      [7, mix.cost.labourCost],
      [8, mix.cost.partsCost],
      [9, mix.cost.totalCost],
    ] as const) {
      const again = recalculated('finance', 'Maintenance cost', 'Total', col);
      expect(sameCents(again, value), `column ${col}: ${again} vs ${value}`).toBe(true);
      expect(sameCents(again, cached('finance', 'Maintenance cost', 'Total', col))).toBe(true);
    }
    const perM3 = recalculated('finance', 'Maintenance cost', 'Maintenance cost per m³ produced (EUR/m³)', 9);
    expect(perM3).toBeCloseTo(mix.cost.costPerM3!, 9);
  });

  it('recomputes the downtime, replacement and budget totals and the summary’s references', async () => {
    const downtime = await api('/api/kpi/downtime', downtimeReportSchema);
    const forecast = await api('/api/kpi/forecast', forecastReportSchema);
    const all = forecast.groups.find((g) => g.key === 'all')!;
    expect(sameCents(recalculated('finance', 'Downtime cost', 'Total', 7), downtime.plant.cost)).toBe(true);
    expect(recalculated('finance', 'Downtime cost', 'Total', 3)).toBeCloseTo(downtime.plant.hours, 6);
    expect(sameCents(recalculated('finance', 'Replacement budget', 'Total', 8), all.total.expectedCost)).toBe(true);
    expect(recalculated('finance', 'Replacement budget', 'Total', 5)).toBeCloseTo(all.total.expectedCount, 9);
    for (const col of [6, 11, 12, 14]) {
      expect(recalculated('finance', 'Element replacements', 'Total', col), `replacements column ${col}`).toBeCloseTo(cached('finance', 'Element replacements', 'Total', col)!, 9);
    }
    expect(sameCents(recalculated('finance', 'Summary', 'Downtime cost (lost permeate at the water value)', 2), downtime.plant.cost)).toBe(true);
    expect(sameCents(recalculated('finance', 'Summary', 'Replacement budget, next 12 months', 2), all.total.expectedCost)).toBe(true);
    expect(sameCents(recalculated('finance', 'Summary', 'Cost of the replacements', 2), cached('finance', 'Element replacements', 'Total', 14))).toBe(true);
  });

  it('recomputes the manager’s downtime by cause and the engineer’s failure count to the API’s', async () => {
    const downtime = await api('/api/kpi/downtime', downtimeReportSchema);
    const reliability = await api('/api/kpi/reliability', reliabilityReportSchema);
    expect(sameCents(recalculated('manager', 'Downtime by cause', 'Total', 7), downtime.plant.cost)).toBe(true);
    expect(recalculated('manager', 'Downtime by cause', 'Total', 2)).toBe(downtime.plant.events);
    expect(recalculated('engineer', 'Failures', 'Total', 2)).toBe(reliability.failures);
    expect(reliability.failures).toBeGreaterThan(0);
  });
});
