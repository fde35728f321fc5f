// The Reports page of the built client in a real browser, against the real API and a test database holding
// the invented operations plant (tests/fixtures/ops-plant.ts): the finance role sees the download buttons
// of its workbooks, downloads one and gets the workbook the API builds (opened here with exceljs), and the
// stored workbooks table. Screenshots go to tests/e2e/screenshots/.
import { mkdirSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import type { Server } from 'node:http';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { writeReport } from '#server/reports/index.ts';
import { buildClient, closeSession, heading, launchChromium, listen, openSession, shot, shotsDir, signIn, tearDown } from './harness.ts';
import { createTestApp, type TestApp } from '../setup/app.ts';
import { numberOf, openWorkbook, rowStartingWith, sameCents } from '../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../fixtures/ops-plant.ts';

const window = 'from=2024-12-01&to=2025-02-01';

let t: TestApp;
let server: Server;
let base: string;
let browser: Browser;
let dist: string;

beforeAll(async () => {
  dist = await buildClient();
  t = await createTestApp({}, { clientDist: dist });
  await seedOpsPlant(t.db);
  // A copy the nightly run would have kept.
  await writeReport(t.db, { name: 'manager', site: SITE, from: '2025-01-01', to: '2025-01-11' }, join(t.env.REPORTS_DIR!, '2025-01-11', 'manager-OPS-2025-01-01-2025-01-11.xlsx'));
  ({ server, base } = await listen(t.app));
  browser = await launchChromium();
  mkdirSync(shotsDir, { recursive: true });
});

afterAll(() => tearDown({ browser, server, t, dirs: [dist] }));

describe('the Reports page', () => {
  it('offers finance its workbooks, downloads the finance workbook and lists the stored ones', async () => {
    const s = await openSession(browser, { viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    await signIn(s, base, 'finance', `/reports?${window}`);
    await heading(s.page, 'Reports');
    const main = s.page.getByRole('main');
    await main.getByRole('button', { name: 'Download the finance workbook' }).waitFor();
    await main.getByRole('button', { name: 'Download the manager workbook' }).waitFor();
    expect(await main.getByRole('button', { name: 'Download the engineer workbook' }).count()).toBe(0);
    expect(await main.innerText()).toContain('Built now for 2024-12-01 to 2025-02-01 (not included)');

    // The stored manager workbook is listed; finance may have it.
    const stored = main.getByRole('table');
    const storedRow = stored.getByRole('row').filter({ hasText: '2025-01-01 – 2025-01-11' });
    await storedRow.waitFor();
    expect(await storedRow.innerText()).toMatch(/2025-01-11\s+Manager\s+OPS/);
    await shot(s.page, 'reports-finance');

    // The toast saying where it went shows for a few seconds: watch for it from the click on.
    const saved = s.page.getByRole('status').filter({ hasText: 'Saved as finance-OPS-2024-12-01-2025-02-01.xlsx.' });
    const [download] = await Promise.all([
      s.page.waitForEvent('download'),
      saved.waitFor(),
      main.getByRole('button', { name: 'Download the finance workbook' }).click(),
    ]);
    await shot(s.page, 'reports-finance-downloaded');
    expect(download.suggestedFilename()).toBe('finance-OPS-2024-12-01-2025-02-01.xlsx');
    const path = join(dist, 'downloaded.xlsx');
    await download.saveAs(path);

    // What arrived is the finance workbook, with the maintenance-mix answer's total.
    const wb = await openWorkbook(await readFile(path));
    expect(wb.worksheets.map((w) => w.name)).toContain('Maintenance cost');
    const res = await request(t.app).get(`/api/kpi/maintenance-mix?site=${SITE}&${window}`).set('Cookie', t.cookies.finance);
    const mix = maintenanceMixReportSchema.parse(res.body);
    expect(sameCents(numberOf(rowStartingWith(wb.getWorksheet('Maintenance cost')!, 'Total').getCell(9)), mix.cost.totalCost)).toBe(true);

    // The stored copy downloads too.
    const [storedDownload] = await Promise.all([
      s.page.waitForEvent('download'),
      stored.getByRole('button', { name: 'Download manager-OPS-2025-01-01-2025-01-11.xlsx of 2025-01-11' }).click(),
    ]);
    expect(storedDownload.suggestedFilename()).toBe('manager-OPS-2025-01-01-2025-01-11.xlsx');
    await closeSession(s);
  });

  it('offers the manager and the engineer the workbooks of their roles', async () => {
    const s = await openSession(browser, { viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    await signIn(s, base, 'manager', '/reports');
    await heading(s.page, 'Reports');
    const main = s.page.getByRole('main');
    await main.getByRole('button', { name: 'Download the manager workbook' }).waitFor();
    expect(await main.getByRole('button', { name: /Download the (finance|engineer) workbook/ }).count()).toBe(0);
    expect(await main.innerText()).toContain('Built now for the whole range of the site’s data');
    await closeSession(s);

    const e = await openSession(browser, { viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    await signIn(e, base, 'engineer', '/reports');
    await heading(e.page, 'Reports');
    const em = e.page.getByRole('main');
    await em.getByRole('button', { name: 'Download the engineer workbook' }).waitFor();
    await em.getByRole('button', { name: 'Download the manager workbook' }).waitFor();
    await shot(e.page, 'reports-engineer');
    await closeSession(e);
  });
});
