// The KPI pages of the built client in a real browser, against the real API and a test database that
// holds the invented demo plant (imported through the importers, then refreshed). Each page is opened
// by a role that may read it; its key figures must match the API's answer, read nothing like NaN or
// "undefined", and raise no console error. Every step leaves a screenshot in tests/e2e/screenshots/.
import { mkdirSync, mkdtempSync } from 'node:fs';
import type { Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ZodType, z } from 'zod';
import { chemicalHandlingCaution, isolateAndDepressurizeCaution } from '#shared/cautions.ts';
import type { Role } from '#shared/schemas/enums.ts';
import { importHistorySchema } from '#shared/schemas/imports.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { settingsSchema } from '#shared/schemas/settings.ts';
import { openWorkOrdersSchema } from '#shared/schemas/work-orders.ts';
import { seedDemo } from '#server/demo/seed.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { buildClient, closeSession, heading, launchChromium, listen, mainText, openSession, shot, shotsDir, signIn, tearDown } from './harness.ts';
import { createTestApp, type TestApp } from '../setup/app.ts';
import { runCli } from '../setup/cli.ts';


let t: TestApp;
let server: Server;
let base: string;
let browser: Browser;
let dist: string;
let demoDir: string;
/** The demo plant's time zone: the browser reads dates as someone at the plant would. */
let timeZone: string;
/** The demo site's code, for imports made by a test. */
let siteCode: string;

beforeAll(async () => {
  dist = await buildClient();
  t = await createTestApp({}, { clientDist: dist });
  demoDir = mkdtempSync(join(tmpdir(), 'osmia-demo-e2e-'));
  const seeded = await seedDemo(t.db, { outDir: demoDir, years: 1, stepMinutes: 60 });
  timeZone = seeded.manifest.site.timeZone;
  siteCode = seeded.manifest.site.code;
  ({ server, base } = await listen(t.app));
  browser = await launchChromium();
  mkdirSync(shotsDir, { recursive: true });
});

afterAll(() => tearDown({ browser, server, t, dirs: [dist, demoDir] }));

/** The API's answer to `path` for `role`, parsed with the shared schema: what the page must show. */
async function api<S extends ZodType>(role: Role, path: string, schema: S): Promise<z.infer<S>> {
  const res = await request(t.app).get(path).set('Cookie', t.cookies[role]);
  expect(res.status, `${path} as ${role}`).toBe(200);
  return schema.parse(res.body);
}

// Figures as the page writes them for an en-GB reader (src/lib/format.ts).
const int = (n: number) => new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 }).format(n);
const euros = (n: number) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'EUR', maximumFractionDigits: 0, minimumFractionDigits: 0 }).format(n);

/** Waits until `count` charts have drawn (they load on demand) and no section still shows a spinner. */
async function chartsDrawn(page: Page, count: number) {
  await expect.poll(() => page.locator('figure [role="img"] svg').count(), { timeout: 20_000 }).toBeGreaterThanOrEqual(count);
  await expect.poll(() => page.getByRole('status').filter({ hasText: /Loading/ }).count(), { timeout: 20_000 }).toBe(0);
}

describe('the KPI pages with the demo plant', () => {
  it('dashboard (admin): trains, maintenance mix, downtime, replacement forecast and performance alerts with the cleaning cautions', async () => {
    const reliability = await api('admin', '/api/kpi/reliability?groupBy=asset', reliabilityReportSchema);
    const forecast = await api('admin', '/api/kpi/forecast', forecastReportSchema);
    const downtime = await api('admin', '/api/kpi/downtime', downtimeReportSchema);
    const mix = await api('admin', '/api/kpi/maintenance-mix', maintenanceMixReportSchema);
    const performance = await api('admin', '/api/kpi/performance', performanceReportSchema);

    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'admin', '/');
    await heading(s.page, 'Dashboard');
    await s.page.getByRole('region', { name: 'Element replacements, next 12 months' }).waitFor();
    const trains = s.page.getByRole('region', { name: 'Trains' });
    await trains.waitFor();
    // Trains are the top-level assets: each appears with its own MTBF.
    const trainText = await trains.innerText();
    for (const code of ['T1', 'T2']) {
      const group = reliability.groups!.find((g) => g.asset === code)!;
      expect(trainText).toContain(code);
      expect(trainText).toContain(`${int(group.mtbfHours!)} h`);
    }
    const forecastCard = await s.page.getByRole('region', { name: 'Element replacements, next 12 months' }).innerText();
    expect(forecastCard).toContain(int(forecast.groups[0].total.expectedCount));
    expect(forecastCard).toContain(euros(forecast.groups[0].total.expectedCost));
    const downtimeCard = await s.page.getByRole('region', { name: 'Downtime' }).innerText();
    expect(downtimeCard).toContain(`${int(downtime.events.length)} stops`);
    const top = [...downtime.totals].sort((a, b) => b.hours - a.hours)[0];
    expect(downtimeCard).toContain(euros(top.cost!));
    const mixCard = await s.page.getByRole('region', { name: 'Maintenance mix' }).innerText();
    expect(mixCard).toContain(`${int(mix.pmCompliance.compliance! * 100)} %`);
    expect(mixCard).toContain(`${mix.pmCompliance.completedInWindow} of ${mix.pmCompliance.due} preventive orders done`);

    const alerts = performance.stages.flatMap((st) => st.alerts);
    const alertCard = s.page.getByRole('region', { name: 'Membrane performance alerts' });
    if (alerts.length > 0) {
      await alertCard.getByRole('complementary', { name: 'Safety before any work on the plant' }).waitFor();
      expect(await alertCard.innerText()).toContain(chemicalHandlingCaution);
    } else {
      await alertCard.getByText('No stage is beyond an alert threshold.').waitFor();
    }
    await s.page.getByText('All systems running').waitFor();
    await mainText(s.page);
    await shot(s.page, 'kpi-dashboard-admin');
    await closeSession(s);
  });

  it('dashboard (finance): only what the role may read, with costs in the plant’s currency', async () => {
    const settings = await api('finance', '/api/settings', settingsSchema);
    expect(settings.currency).toBe('EUR');
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'finance', '/');
    await heading(s.page, 'Dashboard');
    await s.page.getByRole('region', { name: 'Element replacements, next 12 months' }).waitFor();
    await s.page.getByRole('region', { name: 'Downtime' }).waitFor();
    await s.page.getByRole('region', { name: 'Maintenance mix' }).waitFor();
    // Finance may not read reliability or performance: those sections are not there, and nothing was refused.
    expect(await s.page.getByRole('region', { name: 'Trains' }).count()).toBe(0);
    expect(await s.page.getByRole('region', { name: 'Membrane performance alerts' }).count()).toBe(0);
    const text = await mainText(s.page);
    expect(text).toMatch(/€\d/);
    await shot(s.page, 'kpi-dashboard-finance');
    await closeSession(s);
  });

  it('reliability (engineer): per-asset table with bounds, MTBF chart, provenance, and a window kept in the address', async () => {
    const report = await api('engineer', '/api/kpi/reliability?groupBy=asset', reliabilityReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'engineer', '/reliability');
    await heading(s.page, 'Reliability');
    await chartsDrawn(s.page, 1);
    const table = s.page.getByRole('table');
    await expect.poll(() => table.getByRole('row').count()).toBe(report.groups!.length + 1);
    const t1 = report.groups!.find((g) => g.asset === 'T1')!;
    const row = await table.getByRole('row').filter({ has: s.page.getByText('T1', { exact: true }) }).innerText();
    expect(row).toContain(`${int(t1.mtbfHours!)} h`);
    expect(row).toContain(`${int(t1.mtbfLowerHours!)} – ${int(t1.mtbfUpperHours!)} h`);
    expect(row).toContain('own run status');
    const text = await mainText(s.page);
    expect(text).toContain(`${int(report.failures)}`);
    await s.page.getByText(/^Computed from \d+ work orders/).click();
    await s.page.getByText(report.provenance!.workOrders[0], { exact: true }).first().waitFor();
    await shot(s.page, 'reliability-engineer');

    // A window set in the filter bar lands in the address and is read back from it.
    await s.page.getByLabel('From').fill('2026-01-01');
    await s.page.getByLabel('Until').fill('2026-07-01');
    await s.page.getByRole('button', { name: 'Apply' }).click();
    await s.page.waitForURL((url) => url.searchParams.get('from') === '2026-01-01' && url.searchParams.get('to') === '2026-07-01');
    await s.page.getByText('1 Jan 2026 – 1 Jul 2026').waitFor();
    const windowed = await api('engineer', '/api/kpi/reliability?groupBy=asset&from=2026-01-01&to=2026-07-01', reliabilityReportSchema);
    await s.page.getByRole('region', { name: 'Reliability of the site' }).getByText(`${int(windowed.operatingHours)} h`, { exact: true }).waitFor();
    await s.page.reload();
    await heading(s.page, 'Reliability');
    expect(await s.page.getByLabel('From').inputValue()).toBe('2026-01-01');
    // An empty window is refused before it is asked for.
    await s.page.getByLabel('From').fill('2026-08-01');
    await s.page.getByRole('button', { name: 'Apply' }).click();
    await s.page.getByText('“From” must be before “Until”', { exact: false }).waitFor();
    await mainText(s.page);
    await shot(s.page, 'reliability-engineer-window');
    await closeSession(s);
  });

  it('reliability is refused to finance with the role panel, not a blank page', async () => {
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'finance', '/reliability');
    await s.page.getByRole('heading', { name: 'Your role does not allow this page' }).waitFor();
    await shot(s.page, 'reliability-refused-finance');
    await closeSession(s);
  });

  it('element life & forecast (finance): survival curves, Weibull table, forecast with its band and the vessel-work cautions', async () => {
    const life = await api('finance', '/api/kpi/element-life', elementLifeReportSchema);
    const forecast = await api('finance', '/api/kpi/forecast', forecastReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'finance', '/element-life');
    await heading(s.page, 'Element life & forecast');
    await chartsDrawn(s.page, 2);
    const forecastCard = s.page.getByRole('region', { name: 'Replacement forecast, next 12 months' });
    const forecastText = await forecastCard.innerText();
    expect(forecastText).toContain(euros(forecast.groups[0].total.expectedCost));
    expect(forecastText).toContain(`90 % band ${euros(forecast.groups[0].total.costLower!)} – ${euros(forecast.groups[0].total.costUpper!)}`);
    expect(forecastText).toContain(isolateAndDepressurizeCaution);
    // Vessel work uses no cleaning chemicals: that caution is not among these.
    expect(forecastText).not.toContain(chemicalHandlingCaution);
    const weibull = s.page.getByRole('table', { name: /Weibull fit/ });
    const all = await weibull.getByRole('row').filter({ hasText: 'All elements' }).innerText();
    expect(all).toContain(int(life.groups[0].n));
    expect(all).toContain(`${int(life.groups[0].b10Days!)} d`);
    await mainText(s.page);
    await shot(s.page, 'element-life-finance');

    await s.page.getByLabel('Group by').selectOption('stage');
    await s.page.waitForURL((url) => url.searchParams.get('groupBy') === 'stage');
    const byStage = await api('finance', '/api/kpi/element-life?groupBy=stage', elementLifeReportSchema);
    await expect.poll(() => weibull.getByRole('row').count()).toBe(byStage.groups.length + 1);
    await chartsDrawn(s.page, 2);
    await s.page.getByRole('table', { name: 'Forecast by group' }).waitFor();
    await mainText(s.page);
    await shot(s.page, 'element-life-by-stage');
    await closeSession(s);
  });

  it('time to complete (manager): groups with the quantile method, guided vs unguided, learning curve, jobs and the vessel-work cautions', async () => {
    const report = await api('manager', '/api/kpi/time-to-complete', timeToCompleteReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', '/time-to-complete');
    await heading(s.page, 'Jobs / time to complete');
    await chartsDrawn(s.page, 1);
    const text = await mainText(s.page);
    expect(text).toContain(report.quantileMethod);
    expect(text).toContain(`${report.jobs.length} jobs`);
    expect(text).toContain(isolateAndDepressurizeCaution);
    const guided = report.groups.find((g) => g.key === 'guided=yes')!;
    const comparison = await s.page.getByRole('region', { name: 'Guided vs unguided' }).innerText();
    expect(comparison).toContain(`${guided.n} and`);
    await s.page.getByLabel('Buckets', { exact: true }).selectOption('bySequence');
    await chartsDrawn(s.page, 1);
    await shot(s.page, 'time-to-complete-manager');
    await s.page.getByRole('button', { name: 'Show all' }).click();
    await expect.poll(() => s.page.getByRole('table', { name: /jobs, each from/ }).getByRole('row').count()).toBe(report.jobs.length + 1);
    await mainText(s.page);
    await closeSession(s);
  });

  it('downtime (finance): Pareto charts, totals with cost, and the stops', async () => {
    const report = await api('finance', '/api/kpi/downtime', downtimeReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'finance', '/downtime');
    await heading(s.page, 'Downtime');
    await chartsDrawn(s.page, 2);
    const text = await mainText(s.page);
    expect(text).toContain(`${int(report.events.length)} stops`);
    const totals = s.page.getByRole('table', { name: 'Down time by asset' });
    await expect.poll(() => totals.getByRole('row').count()).toBe(report.totals.length + 1);
    const first = report.totals[0];
    const row = await totals.getByRole('row').filter({ has: s.page.getByText(first.asset, { exact: true }) }).innerText();
    expect(row).toContain(`${int(first.lostVolumeM3!)} m³`);
    expect(row).toContain(euros(first.cost!));
    await shot(s.page, 'downtime-finance');
    await closeSession(s);
  });

  it('membrane performance (engineer): every stage against its baseline, thresholds drawn, alerts with the cleaning cautions', async () => {
    const report = await api('engineer', '/api/kpi/performance', performanceReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'engineer', '/performance');
    await heading(s.page, 'Membrane performance');
    // Three charts per stage: permeate flow, salt passage, differential pressure.
    await chartsDrawn(s.page, report.stages.length * 3);
    for (const stage of report.stages) {
      const card = await s.page.getByRole('region', { name: `Stage ${stage.asset}` }).innerText();
      expect(card).toContain('Baseline');
      expect(card).toContain('alert at −10 %');
    }
    const alerts = report.stages.flatMap((st) => st.alerts);
    const text = await mainText(s.page);
    if (alerts.length > 0) {
      expect(text).toContain(alerts[0].message);
      expect(text).toContain(chemicalHandlingCaution);
    }
    await shot(s.page, 'performance-engineer');
    await closeSession(s);
  });

  it('imports (engineer): a dry run keeps nothing; an upload lands in the history with its rejects and their CSV', async () => {
    const before = await api('engineer', '/api/imports', importHistorySchema);
    // Two work orders: the first is valid, the second has a type Osmia does not know (line 3).
    const csv = [
      'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
      'WO-E2E-1,T1-HPP,corrective,high,closed,SEAL-LEAK,Seal leak on the high-pressure pump,2026-09-20T08:00:00Z,2026-09-20T09:00:00Z,2026-09-20T12:00:00Z,2026-09-20T09:00:00Z,2026-09-20T12:00:00Z,3,240,180,crew-a',
      'WO-E2E-2,T1-HPP,repair,high,closed,SEAL-LEAK,Same leak again,2026-09-21T08:00:00Z,,,,,,,,crew-a',
    ].join('\n');
    const file = { name: 'e2e-work-orders.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) };

    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'engineer', '/imports');
    await heading(s.page, 'Imports');
    const history = s.page.getByRole('table', { name: /Import history/ });
    await expect.poll(() => history.getByRole('row').count()).toBe(before.imports.length + 1);
    await shot(s.page, 'imports-engineer');

    const form = s.page.getByRole('region', { name: 'Import a file' });

    // Upload progress: a 300 kB historian file (a dry run) through a link slowed to 100 kB/s.
    const samples = Array.from({ length: 8000 }, (_, i) => `${new Date(Date.UTC(2026, 8, 1) + i * 60_000).toISOString()},T1.RUN,1,good`);
    const big = { name: 'e2e-historian.csv', mimeType: 'text/csv', buffer: Buffer.from(['timestamp,tag,value,quality', ...samples].join('\n')) };
    const cdp = await s.context.newCDPSession(s.page);
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: 100 * 1024 });
    await form.getByLabel('Kind of file').selectOption('historian');
    await form.getByLabel('File', { exact: true }).setInputFiles(big);
    await form.getByLabel('Dry run').check();
    await form.getByRole('button', { name: 'Check the file' }).click();
    const progress = form.getByRole('progressbar', { name: 'Upload' });
    await expect.poll(async () => Number((await progress.getAttribute('aria-valuenow')) ?? 0), { timeout: 10_000, interval: 100 }).toBeGreaterThan(0);
    expect(Number(await progress.getAttribute('aria-valuenow'))).toBeLessThan(100);
    await shot(s.page, 'imports-uploading');
    await s.page.getByRole('region', { name: 'Dry run result' }).getByText('e2e-historian.csv').waitFor({ timeout: 20_000 });
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

    await form.getByLabel('Kind of file').selectOption('work-orders');
    await form.getByLabel('File', { exact: true }).setInputFiles(file);
    await form.getByLabel('Dry run').check();
    await form.getByRole('button', { name: 'Check the file' }).click();
    // The region is there already from the historian's dry run: wait for this file's result in it.
    const dry = s.page.getByRole('region', { name: 'Dry run result' });
    await dry.getByText('e2e-work-orders.csv').waitFor();
    expect(await dry.innerText()).toContain('A dry run: nothing was kept');
    expect((await api('engineer', '/api/imports', importHistorySchema)).imports).toHaveLength(before.imports.length);

    await form.getByLabel('File', { exact: true }).setInputFiles(file);
    await form.getByLabel('Dry run').uncheck();
    await form.getByRole('button', { name: 'Import', exact: true }).click();
    const result = s.page.getByRole('region', { name: 'Import result' });
    await result.waitFor();
    const resultText = await result.innerText();
    expect(resultText).toContain('partial');
    expect(resultText).toContain('e2e-work-orders.csv');
    const rejects = result.getByRole('table', { name: /rejected row/ });
    const line3 = await rejects.getByRole('row').filter({ has: s.page.getByRole('cell', { name: '3', exact: true }) }).innerText();
    expect(line3.length).toBeGreaterThan(2);

    // The history shows the new import, newest first.
    await expect.poll(() => history.getByRole('row').count()).toBe(before.imports.length + 2);
    expect(await history.getByRole('row').nth(1).innerText()).toContain('e2e-work-orders.csv');
    const after = await api('engineer', '/api/imports', importHistorySchema);
    const record = after.imports.find((i) => i.file === 'e2e-work-orders.csv')!;
    expect(record).toMatchObject({ status: 'partial', rowsInserted: 1, rowsRejected: 1 });

    // Its details, and the CSV of all its rejects behind the link.
    await s.page.getByRole('button', { name: `Details of import ${record.id} (e2e-work-orders.csv)` }).click();
    const detail = s.page.getByRole('region', { name: `Import ${record.id}`, exact: true });
    await detail.getByRole('table', { name: /rejected row/ }).waitFor();
    const href = await detail.getByRole('link', { name: 'Download all rejects (CSV)' }).getAttribute('href');
    expect(href).toBe(`/api/imports/${record.id}/rejects.csv`);
    const download = await s.page.request.get(`${base}${href}`);
    expect(download.status()).toBe(200);
    const lines = (await download.text()).trim().split(/\r?\n/);
    expect(lines[0]).toBe('line,reason,row');
    expect(lines[1]).toMatch(/^3,/);
    await mainText(s.page);
    await shot(s.page, 'imports-result');
    await closeSession(s);
  });

  it('fits a phone-sized screen', async () => {
    const s = await openSession(browser, { viewport: { width: 390, height: 844 }, timezoneId: timeZone });
    await signIn(s, base, 'manager', '/');
    await heading(s.page, 'Dashboard');
    await s.page.getByRole('region', { name: 'Element replacements, next 12 months' }).waitFor();
    await s.page.getByRole('region', { name: 'Trains' }).waitFor();
    const overflow = await s.page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBe(0);
    await mainText(s.page);
    await shot(s.page, 'kpi-dashboard-phone');
    await closeSession(s);
  });
  it('one window, the same figures: the downtime page, the API and the CLI agree', async () => {
    const window = { from: '2026-01-01', to: '2026-07-01' };
    const report = await api('manager', `/api/kpi/downtime?from=${window.from}&to=${window.to}`, downtimeReportSchema);
    expect(report.plant.events).toBeGreaterThan(0);
    // The CLI computes the same object from the same database.
    const cli = runCli(t.url, ['kpi', 'downtime', '--from', window.from, '--to', window.to, '--json']);
    expect(cli.code, cli.err).toBe(0);
    expect(downtimeReportSchema.parse(JSON.parse(cli.out))).toEqual(report);
    // The page's headline figures for the window in its address.
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', `/downtime?from=${window.from}&to=${window.to}`);
    await heading(s.page, 'Downtime');
    await chartsDrawn(s.page, 2);
    const text = await mainText(s.page);
    const hours = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 }).format(report.plant.hours);
    expect(text).toContain(`add up to the plant’s ${hours} h in ${report.plant.events} stops`);
    expect(text).toContain(`${int(report.events.length)} stops`);
    const totals = s.page.getByRole('table', { name: 'Down time by asset' });
    for (const total of report.totals.filter((x) => x.events > 0)) {
      const row = await totals.getByRole('row').filter({ has: s.page.getByText(total.asset, { exact: true }) }).innerText();
      expect(row, total.asset).toContain(`${int(total.lostVolumeM3!)} m³`);
      expect(row, total.asset).toContain(euros(total.cost!));
    }
    await shot(s.page, 'downtime-window-manager');
    await closeSession(s);
  });
});

// What a new user met on the pages: overlapping axis labels, a blank first paint,
// the same answer fetched several times, raw timestamps and code marks in text, and role dashboards.

/** Boxes of text a person should be able to read one by one, in page pixels. */
interface Box {
  text: string;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

const overlaps = (a: Box, b: Box) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;

/** Labels of the time axes of every chart on the page ("Mar 26", "3 Mar", "2026"), chart by chart. */
async function timeAxisLabels(page: Page): Promise<Box[][]> {
  return page.locator('figure [role="img"] svg').evaluateAll((svgs) =>
    svgs.map((svg) =>
      [...svg.querySelectorAll('text')]
        .filter((t) => /^(\d{1,2} \p{L}{3,4}\.?|\p{L}{3,4}\.? \d{2}|\d{4})$/u.test(t.textContent?.trim() ?? ''))
        .map((t) => {
          const r = t.getBoundingClientRect();
          return { text: t.textContent!.trim(), left: r.left, right: r.right, top: r.top, bottom: r.bottom };
        }),
    ),
  );
}

/** Text a person reads never shows a raw ISO instant, a lazy "(s)" plural or a literal backtick. */
function readable(text: string, where: string) {
  expect(text, `${where}: raw timestamp`).not.toMatch(/\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/);
  expect(text, `${where}: "(s)" plural`).not.toMatch(/\w\(s\)/);
  expect(text, `${where}: literal backtick`).not.toContain('`');
}

describe('what a new user meets on the pages: readable axes, a first paint, one request per answer, text a person reads, role dashboards', () => {
  it.each([1280, 800])('membrane performance at %i px: every time axis has at least two labels and none overlaps another', async (width) => {
    const report = await api('engineer', '/api/kpi/performance', performanceReportSchema);
    const s = await openSession(browser, { viewport: { width, height: 900 }, timezoneId: timeZone });
    await signIn(s, base, 'engineer', '/performance');
    await heading(s.page, 'Membrane performance');
    await chartsDrawn(s.page, report.stages.length * 3);
    const charts = await timeAxisLabels(s.page);
    expect(charts).toHaveLength(report.stages.length * 3);
    for (const [i, labels] of charts.entries()) {
      expect(labels.length, `chart ${i}: ${labels.map((l) => l.text).join(' | ')}`).toBeGreaterThanOrEqual(2);
      for (let a = 0; a < labels.length; a++) {
        for (let b = a + 1; b < labels.length; b++) {
          expect(overlaps(labels[a], labels[b]), `chart ${i}: "${labels[a].text}" and "${labels[b].text}" overlap`).toBe(false);
        }
      }
    }
    // The notes under each stage read as sentences: no raw instant of the baseline, no "point(s)".
    readable(await mainText(s.page), `performance at ${width} px`);
    await shot(s.page, `readable-performance-${width}`);
    await closeSession(s);
  });

  it('a full load with a window in the address shows the loading shell at once, then the page, without the HydrateFallback warning', async () => {
    const s = await openSession(browser, { timezoneId: timeZone });
    const warnings: string[] = [];
    s.page.on('console', (msg) => warnings.push(msg.text()));
    await signIn(s, base, 'engineer', '/');
    await heading(s.page, 'Dashboard');
    // Slow answers, as a cold server gives them for a window nobody asked for yet.
    await s.page.route('**/api/kpi/**', async (route) => {
      await new Promise((resolve) => setTimeout(resolve, 1500));
      await route.continue();
    });
    await s.page.goto(`${base}/performance?from=2026-02-01&to=2026-06-01`, { waitUntil: 'domcontentloaded' });
    const shell = s.page.getByRole('status', { name: 'Loading Osmia' });
    expect(await shell.isVisible(), 'the loading shell right after DOMContentLoaded').toBe(true);
    // Once React runs, the router renders the same shell (its HydrateFallback) while the loaders wait for the
    // slowed answers; without one React would have replaced the markup of index.html with nothing.
    await s.page.waitForLoadState('load');
    await s.page.waitForTimeout(500);
    expect(await shell.isVisible(), 'the loading shell while the loaders wait').toBe(true);
    await shot(s.page, 'readable-loading-shell');
    await heading(s.page, 'Membrane performance');
    expect(await shell.count()).toBe(0);
    await s.page.unroute('**/api/kpi/**');
    expect(warnings.filter((w) => /HydrateFallback/.test(w))).toEqual([]);
    await closeSession(s);
  });

  it('dashboard and downtime ask for each KPI answer once per load, also when following the dashboard link', async () => {
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', '/');
    await heading(s.page, 'Dashboard');
    const counts = new Map<string, number>();
    s.page.on('request', (r) => {
      const url = new URL(r.url());
      if (/^\/api\/(kpi|work-orders)\//.test(url.pathname)) counts.set(url.pathname + url.search, (counts.get(url.pathname + url.search) ?? 0) + 1);
    });
    const load = async (path: string, title: string, then?: () => Promise<void>) => {
      counts.clear();
      await s.page.goto(`${base}${path}`);
      await heading(s.page, title);
      await then?.();
      await s.page.waitForLoadState('networkidle');
      const repeated = [...counts].filter(([, n]) => n > 1);
      expect(repeated, `${path}: URLs asked for more than once`).toEqual([]);
      expect(counts.size, `${path}: no KPI request seen`).toBeGreaterThan(0);
      return new Map(counts);
    };
    const window = '?from=2026-01-01&to=2026-07-01';
    const dashboard = await load(`/${window}`, 'Dashboard');
    expect([...dashboard.keys()].filter((u) => u.startsWith('/api/kpi/downtime'))).toEqual(['/api/kpi/downtime?from=2026-01-01&to=2026-07-01']);
    await load(`/downtime${window}`, 'Downtime');
    await load('/downtime', 'Downtime');
    await load('/', 'Dashboard');
    // From the dashboard to the downtime page by its link: the dashboard's answer serves the page.
    counts.clear();
    await s.page.getByRole('link', { name: 'Downtime in detail →' }).click();
    await heading(s.page, 'Downtime');
    await s.page.waitForLoadState('networkidle');
    expect([...counts].filter(([u]) => u.startsWith('/api/kpi/downtime'))).toEqual([]);
    await closeSession(s);
  });

  it('reliability (manager): MTBF keeps its unit on its line, wide bounds are marked and explained, and notes read as sentences', async () => {
    const report = await api('manager', '/api/kpi/reliability?groupBy=asset', reliabilityReportSchema);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', '/reliability');
    await heading(s.page, 'Reliability');
    const table = s.page.getByRole('table');
    await expect.poll(() => table.getByRole('row').count()).toBe(report.groups!.length + 1);
    // Each MTBF figure is drawn on one line: an inline element that wraps has more than one client rect.
    const lines = await table.locator('tbody td strong').evaluateAll((els) => els.map((e) => [e.textContent, e.getClientRects().length] as const));
    expect(lines.length).toBeGreaterThan(0);
    expect(lines.filter(([, n]) => n !== 1)).toEqual([]);
    const wide = report.groups!.filter((g) => g.mtbfLowerHours !== null && g.mtbfUpperHours !== null && (g.failures <= 2 || g.mtbfUpperHours / g.mtbfLowerHours > 10));
    expect(wide.length, 'the demo plant has assets with one or two failures').toBeGreaterThan(0);
    const one = wide[0];
    const row = await table.getByRole('row').filter({ has: s.page.getByText(one.asset!, { exact: true }) }).innerText();
    expect(row).toContain(one.failures === 1 ? 'wide: one failure' : `wide: ${one.failures} failures`);
    const narrow = report.groups!.find((g) => g.failures > 2 && g.mtbfUpperHours !== null && g.mtbfUpperHours / g.mtbfLowerHours! <= 10)!;
    const narrowRow = await table.getByRole('row').filter({ has: s.page.getByText(narrow.asset!, { exact: true }) }).innerText();
    expect(narrowRow).not.toContain('wide');
    await s.page.getByText(/^Wide: with two failures or fewer/).waitFor();
    await s.page.getByText(/^Notes on the data/).click();
    readable(await mainText(s.page), 'reliability');
    await shot(s.page, 'readable-reliability-manager');
    await closeSession(s);
  });

  it('downtime: the Pareto’s 80 % label sits on its axis, clear of every bar and of the cumulative line', async () => {
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'finance', '/downtime');
    await heading(s.page, 'Downtime');
    await chartsDrawn(s.page, 2);
    for (const name of ['Pareto by cause', 'Pareto by asset']) {
      const svg = s.page.getByRole('region', { name }).locator('figure svg').first();
      const found = await svg.evaluate((el) => {
        const box = (e: Element) => {
          const r = e.getBoundingClientRect();
          return { left: r.left, right: r.right, top: r.top, bottom: r.bottom };
        };
        const label = [...el.querySelectorAll('text')].find((t) => t.textContent?.trim() === '80 %');
        const bars = [...el.querySelectorAll('rect')].filter((r) => Number(r.getAttribute('width')) > 0 && Number(r.getAttribute('height')) > 0 && r.closest('g[transform]'));
        return { label: label ? box(label) : null, marks: [...bars, ...el.querySelectorAll('circle')].map(box) };
      });
      expect(found.label, `${name}: an "80 %" label`).not.toBeNull();
      const label = { text: '80 %', ...found.label! };
      const hit = found.marks.filter((m) => overlaps(label, { text: '', ...m }));
      expect(hit, `${name}: marks under the 80 % label`).toEqual([]);
      // Right of every bar, so the line (drawn between bar centres) cannot reach it either.
      const rightmost = Math.max(...found.marks.map((m) => m.right));
      expect(label.left).toBeGreaterThanOrEqual(rightmost);
    }
    await closeSession(s);
  });

  it('settings (manager): constants read with a sensible precision and their units', async () => {
    const settings = await api('manager', '/api/settings', settingsSchema);
    expect(settings.osmoticBarPerMgL).toBeCloseTo(0.000689475729, 12);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', '/settings');
    await heading(s.page, 'Settings');
    const text = await mainText(s.page);
    expect(text).not.toContain('0.000689475729');
    expect(text).toMatch(/0\.0006895\s+bar per mg\/L/);
    expect(text).toMatch(/3,020\s+K/);
    await shot(s.page, 'readable-settings-manager');
    await closeSession(s);
  });

  const grids: [Role, boolean, boolean][] = [
    ['admin', true, true],
    ['engineer', true, true],
    ['manager', true, false],
    ['finance', false, false],
  ];
  it.each(grids)('dashboard (%s): open work %s, server health %s, and no hole in the grid at 1280, 800 and 390 px', async (role, openWork, health) => {
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, role, '/');
    for (const width of [1280, 800, 390]) {
      await s.page.setViewportSize({ width, height: 900 });
      await s.page.goto(`${base}/`);
      await heading(s.page, 'Dashboard');
      await s.page.getByRole('region', { name: 'Downtime' }).waitFor();
      await s.page.getByRole('region', { name: 'Element replacements, next 12 months' }).waitFor();
      expect(await s.page.getByRole('region', { name: 'Open work' }).count()).toBe(openWork ? 1 : 0);
      expect(await s.page.getByRole('region', { name: 'Server health' }).count()).toBe(health ? 1 : 0);
      // The cells of the card grid tile it: each row holds two cards side by side or one as wide as the grid.
      const grid = s.page.getByRole('region', { name: 'Downtime' }).locator('xpath=../..');
      const layout = await grid.evaluate((el) => ({
        width: el.getBoundingClientRect().width,
        cells: [...el.children].map((c) => {
          const r = c.getBoundingClientRect();
          return { top: Math.round(r.top), width: r.width };
        }),
      }));
      const rows = new Map<number, number[]>();
      for (const c of layout.cells) rows.set(c.top, [...(rows.get(c.top) ?? []), c.width]);
      for (const [top, widths] of rows) {
        const full = widths.length === 1 && Math.abs(widths[0] - layout.width) < 1;
        expect(full || widths.length === 2, `${role} at ${width} px: row at ${top} has ${widths.length} card(s) of ${widths.join(', ')} px in ${layout.width} px`).toBe(true);
      }
      const overflow = await s.page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, `${role} at ${width} px: page wider than the screen`).toBe(0);
      readable(await mainText(s.page), `dashboard ${role} ${width}`);
      await shot(s.page, `readable-dashboard-${role}-${width}`);
    }
    await closeSession(s);
  });

  it('open work (manager): the card lists the API’s open and overdue orders and the backlog hours, with the cautions', async () => {
    const open = await api('manager', '/api/work-orders/open?limit=8', openWorkOrdersSchema);
    expect(open.total).toBeGreaterThan(0);
    const s = await openSession(browser, { timezoneId: timeZone });
    await signIn(s, base, 'manager', '/');
    const card = s.page.getByRole('region', { name: 'Open work' });
    await card.waitFor();
    const text = await card.innerText();
    expect(text).toContain(`Open\n${int(open.total)}`);
    expect(text).toContain(`Overdue\n${int(open.overdue)}`);
    expect(text).toContain(`${int(open.hours)} h`);
    const rows = card.getByRole('table', { name: 'Open work orders, overdue first' }).getByRole('row');
    await expect.poll(() => rows.count()).toBe(open.workOrders.length + 1);
    expect(await rows.nth(1).innerText()).toContain(open.workOrders[0].woNumber);
    expect(await card.getByText('overdue', { exact: true }).count()).toBe(open.workOrders.filter((o) => o.overdue).length);
    expect(await card.getByRole('complementary', { name: 'Safety before any work on the plant' }).innerText()).toContain(isolateAndDepressurizeCaution);
    await closeSession(s);
  });

  it('derived data lagging more than a request rebuilds shows as a banner naming the command, and clears after refresh', async () => {
    // What a bulk load with --no-refresh leaves: years of queued hours for a run-status tag.
    await t.db.$client.query(
      `insert into dirty_hours (tag_id, from_hour, to_hour) select id, '2020-01-01', '2026-06-16' from tags where name = 'T1.RUN' and site_id = (select id from sites where code = $1)`,
      [siteCode],
    );
    try {
      const report = await api('finance', '/api/kpi/downtime', downtimeReportSchema);
      expect(report.derivedUpToDate).toBe(false);
      expect(report.warnings).toEqual([expect.stringContaining('Run "bin/osmia refresh", then ask again.')]);
      const s = await openSession(browser, { timezoneId: timeZone });
      await signIn(s, base, 'finance', '/downtime');
      await heading(s.page, 'Downtime');
      const banner = s.page.getByRole('alert').filter({ hasText: 'These figures may be incomplete' });
      await banner.first().waitFor();
      expect(await banner.first().innerText()).toContain(report.warnings[0]);
      readable(await mainText(s.page), 'downtime banner');
      await shot(s.page, 'downtime-lagging-banner');
      await closeSession(s);
    } finally {
      await refresh(t.db);
    }
    expect((await api('finance', '/api/kpi/downtime', downtimeReportSchema)).warnings).toEqual([]);
  });
  it('shows dates in the plant’s zone to a reader in another one', async () => {
    const report = await api('manager', '/api/kpi/downtime?from=2026-01-01&to=2026-07-01', downtimeReportSchema);
    const latest = report.events.reduce((a, b) => (a.from > b.from ? a : b));
    const at = (zone: string) => new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: zone }).format(new Date(latest.from));
    expect(at(timeZone)).not.toBe(at('Asia/Tokyo'));
    const s = await openSession(browser, { timezoneId: 'Asia/Tokyo' });
    await signIn(s, base, 'manager', '/downtime?from=2026-01-01&to=2026-07-01');
    await heading(s.page, 'Downtime');
    const stops = s.page.getByRole('table', { name: /stops$/ });
    await expect.poll(async () => (await stops.innerText()).includes(at(timeZone)), { timeout: 20_000 }).toBe(true);
    expect(await stops.innerText()).not.toContain(at('Asia/Tokyo'));
    await closeSession(s);
  });
});
