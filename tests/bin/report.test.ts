// `bin/osmia report` through the real launcher, against a test database holding the invented operations
// plant (tests/fixtures/ops-plant.ts).
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative, sep } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reportResultSchema } from '#shared/schemas/reports.ts';
import { listStoredReports } from '#server/reports/stored.ts';
import { createTestDatabase, type TestDatabase } from '../setup/db.ts';
import { runCli } from '../setup/cli.ts';
import { openWorkbook } from '../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../fixtures/ops-plant.ts';

let d: TestDatabase;
let dir: string;
const previous = process.env.REPORTS_DIR;

beforeAll(async () => {
  d = await createTestDatabase();
  await seedOpsPlant(d.db);
  dir = mkdtempSync(join(tmpdir(), 'osmia-cli-reports-'));
  // The folder `report` writes to without --out (runCli passes the environment on).
  process.env.REPORTS_DIR = dir;
});
afterAll(async () => {
  if (previous === undefined) delete process.env.REPORTS_DIR;
  else process.env.REPORTS_DIR = previous;
  await d.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('osmia report', () => {
  it('report finance --json writes the workbook under its name in reports/<today>/, prints its path and sheets, and it is listed as stored', async () => {
    const r = runCli(d.url, ['report', 'finance', '--site', SITE, '--from', '2024-12-01', '--to', '2025-02-01', '--json']);
    expect(r.code, r.err).toBe(0);
    const result = reportResultSchema.parse(JSON.parse(r.out));
    const [day, file] = relative(dir, result.path).split(sep);
    expect(day).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(file).toBe('finance-OPS-2024-12-01-2025-02-01.xlsx');
    expect(existsSync(result.path)).toBe(true);
    // The Reports page and GET /api/reports list it beside the nightly run's workbooks.
    expect((await listStoredReports(dir, 'finance')).map((r) => `${r.date}/${r.file}`)).toContain(`${day}/${file}`);
    const wb = await openWorkbook(await readFile(result.path));
    expect(result.sheets).toEqual(wb.worksheets.map((w) => ({ name: w.name, rows: w.rowCount })));
    expect(result.sheets.map((s) => s.name)).toEqual(['Cover', 'Summary', 'Maintenance cost', 'Downtime cost', 'Element replacements', 'Replacement budget']);
  });

  it('report engineer --out writes where it is told, and the window defaults to the days of the data', async () => {
    const out = join(dir, 'nested', 'engineer.xlsx');
    const r = runCli(d.url, ['report', 'engineer', '--out', out]);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain(`Wrote ${out}`);
    expect(r.out).toMatch(/Failures: \d+ rows/);
    const wb = await openWorkbook(await readFile(out));
    const cover = wb.getWorksheet('Cover')!;
    const from = cover.getColumn(2).values.find((v) => typeof v === 'string' && v.endsWith(', included'));
    // The fixture's work orders start with WO-9 on 2024-12-20; its samples end on 2025-01-11.
    expect(from).toMatch(/^2024-12-20 00:00/);
    const to = cover.getColumn(2).values.find((v) => typeof v === 'string' && v.endsWith(', not included'));
    expect(to).toMatch(/^2025-01-12 00:00/);
  });

  it('refuses a --from that is not a calendar date with exit code 2 and says what it wants', () => {
    const r = runCli(d.url, ['report', 'finance', '--site', SITE, '--from', '2025-02-30', '--json']);
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    expect(r.err).toContain('--from: from must be a calendar date, YYYY-MM-DD');
  });

  it('refuses an unknown workbook and an empty window as usage errors (exit 2)', () => {
    const unknown = runCli(d.url, ['report', 'budget']);
    expect(unknown.code).toBe(2);
    expect(unknown.err).toContain('<name>: the workbook is one of finance, manager, engineer');
    const empty = runCli(d.url, ['report', 'manager', '--site', SITE, '--from', '2025-02-01', '--to', '2025-01-01']);
    expect(empty.code).toBe(2);
    expect(empty.err).toContain('The window is empty');
  });
});
