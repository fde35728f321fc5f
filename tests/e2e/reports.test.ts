// The Reports page of the built client in a real browser, against the real API and a test database holding
// the invented operations plant (tests/fixtures/ops-plant.ts): the finance role sees the download buttons
// of its workbooks, downloads one and gets the workbook the API builds (opened here with exceljs), and the
// stored workbooks table. Screenshots go to tests/e2e/screenshots/.
import { mkdirSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import type { Server } from 'node:http';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '#shared/schemas/enums.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { writeReport } from '#server/reports/index.ts';
import { buildClient, launchChromium, listen, tearDown } from './harness.ts';
import { createTestApp, rolePasswords, type TestApp } from '../setup/app.ts';
import { numberOf, openWorkbook, rowStartingWith, sameCents } from '../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../fixtures/ops-plant.ts';

const shotsDir = fileURLToPath(new URL('./screenshots', import.meta.url));
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

interface Session {
  context: BrowserContext;
  page: Page;
  problems: () => string[];
}

async function openSession(): Promise<Session> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, locale: 'en-GB', timezoneId: 'UTC', acceptDownloads: true });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
  page.on('console', (msg) => {
    if (msg.type() !== 'error') return;
    const url = msg.location().url ?? '';
    if (/status of 401/.test(msg.text()) && url.endsWith('/api/auth/me')) return;
    problems.push(`console error: ${msg.text()} (${url})`);
  });
  return { context, page, problems: () => [...problems] };
}

async function signIn(s: Session, role: Role, path: string) {
  await s.page.goto(`${base}${path}`);
  await s.page.waitForURL((url) => url.pathname === '/sign-in');
  await s.page.getByLabel('E-mail').fill(`${role}@test.example`);
  await s.page.getByLabel('Password').fill(rolePasswords[role]);
  await s.page.getByRole('button', { name: 'Sign in' }).click();
  await s.page.getByRole('heading', { level: 1, name: 'Reports', exact: true }).waitFor();
}

describe('the Reports page', () => {
  it('offers finance its workbooks, downloads the finance workbook and lists the stored ones', async () => {
    const s = await openSession();
    await signIn(s, 'finance', `/reports?${window}`);
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
    await s.page.screenshot({ path: join(shotsDir, 'reports-finance.png'), fullPage: true });

    // The toast saying where it went shows for a few seconds: watch for it from the click on.
    const saved = s.page.getByRole('status').filter({ hasText: 'Saved as finance-OPS-2024-12-01-2025-02-01.xlsx.' });
    const [download] = await Promise.all([
      s.page.waitForEvent('download'),
      saved.waitFor(),
      main.getByRole('button', { name: 'Download the finance workbook' }).click(),
    ]);
    await s.page.screenshot({ path: join(shotsDir, 'reports-finance-downloaded.png'), fullPage: true });
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
    const problems = s.problems();
    await s.context.close();
    expect(problems).toEqual([]);
  });

  it('offers the manager and the engineer the workbooks of their roles', async () => {
    const s = await openSession();
    await signIn(s, 'manager', '/reports');
    const main = s.page.getByRole('main');
    await main.getByRole('button', { name: 'Download the manager workbook' }).waitFor();
    expect(await main.getByRole('button', { name: /Download the (finance|engineer) workbook/ }).count()).toBe(0);
    expect(await main.innerText()).toContain('Built now for the whole range of the site’s data');
    await s.context.close();

    const e = await openSession();
    await signIn(e, 'engineer', '/reports');
    const em = e.page.getByRole('main');
    await em.getByRole('button', { name: 'Download the engineer workbook' }).waitFor();
    await em.getByRole('button', { name: 'Download the manager workbook' }).waitFor();
    await e.page.screenshot({ path: join(shotsDir, 'reports-engineer.png'), fullPage: true });
    const problems = e.problems();
    await e.context.close();
    expect(problems).toEqual([]);
  });
});
