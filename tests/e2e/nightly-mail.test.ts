// The Nightly runs and Mail pages of the built client in a real browser, against the real API, after a real
// nightly run (server/jobs/nightly.ts) over an inbox of the invented operations plant, its mail received by the
// development mail server. Screenshots go to tests/e2e/screenshots/; no console error is allowed.
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NightlyRun } from '#shared/schemas/nightly.ts';
import { createApp } from '#server/app.ts';
import { secretKey } from '#server/auth/session.ts';
import { runNightly } from '#server/jobs/nightly.ts';
import { startFakeSmtp, type FakeSmtp } from '#server/mail/fake-smtp.ts';
import { createMailer } from '#server/mail/transport.ts';
import { assetsCsv, historianCsv, tagsCsv, workOrdersCsv } from '../fixtures/ops-plant.ts';
import { buildClient, closeSession, launchChromium, listen, mainText, openSession, shot, shotsDir, signIn, tearDown } from './harness.ts';
import { createTestApp, type TestApp } from '../setup/app.ts';


let t: TestApp;
let server: Server;
let base: string;
let browser: Browser;
let dist: string;
let inbox: string;
let smtp: FakeSmtp;
let run: NightlyRun;

beforeAll(async () => {
  dist = await buildClient();
  t = await createTestApp({}, { clientDist: dist });
  smtp = await startFakeSmtp(t.db);
  for (const role of ['manager', 'finance'] as const) await request(t.app).patch('/api/auth/me').set('Cookie', t.cookies[role]).send({ digest: true });
  inbox = mkdtempSync(join(tmpdir(), 'osmia-e2e-inbox-'));
  writeFileSync(join(inbox, 'plant.csv'), assetsCsv);
  writeFileSync(join(inbox, 'tags.csv'), tagsCsv);
  writeFileSync(join(inbox, 'readings.csv'), historianCsv());
  writeFileSync(join(inbox, 'orders.csv'), workOrdersCsv);
  writeFileSync(join(inbox, 'shift-notes.csv'), 'when,what\n2025-01-08,handover\n');
  const mailer = createMailer(smtp.url, 'Osmia <osmia@osmia.test>');
  run = await runNightly(t.db, { inbox, trigger: 'cli', site: 'OPS', tz: 'UTC', reportDate: '2025-01-08', publicUrl: 'http://osmia.test:3000', mailer });
  mailer.close();
  // The app as `npm start` runs it: told the address of the development mail server it started.
  const app = createApp({ db: t.db, env: { ...t.env, SMTP_URL: smtp.url }, sessionKey: secretKey(t.env.JWT_SECRET) }, { log: () => {}, clientDist: dist });
  ({ server, base } = await listen(app as TestApp['app']));
  browser = await launchChromium();
  mkdirSync(shotsDir, { recursive: true });
});

afterAll(async () => {
  await smtp?.close();
  await tearDown({ browser, server, t, dirs: [dist, inbox] });
});

describe('the Nightly runs page', () => {
  it('lists the run with its outcome, and its details show each file, the steps and the digest figures', async () => {
    expect(run.outcome).toBe('partial');
    const s = await openSession(browser);
    await signIn(s, base, 'admin', '/nightly');
    await s.page.getByRole('heading', { level: 1, name: 'Nightly runs' }).waitFor();
    const row = s.page.getByRole('row').filter({ hasText: `run ${run.id}` });
    await row.waitFor();
    const rowText = await row.innerText();
    expect(rowText).toContain('partial');
    expect(rowText).toContain('4 imported, 1 not imported');
    expect(rowText).toContain('2025-01-08');
    // Two digests (manager, finance) and the membrane alert to the manager.
    expect(rowText).toContain('3 sent');
    await shot(s.page, 'nightly-runs-admin');

    await s.page.getByRole('button', { name: `Details of nightly run ${run.id}` }).click();
    const details = s.page.getByRole('region', { name: `Nightly run ${run.id}` });
    await details.waitFor();
    const files = details.getByRole('table', { name: 'Files: 5' });
    for (const f of run.files) await files.getByRole('row').filter({ hasText: f.file }).waitFor();
    expect(await files.getByRole('row').filter({ hasText: 'shift-notes.csv' }).innerText()).toMatch(/not imported[\s\S]*failed\/\d{4}-\d{2}-\d{2}\/shift-notes\.csv/);
    // The figures the digest reported, as the page writes them (src/lib/format.ts, en-GB): 8 h of downtime yesterday.
    const figures = details.getByRole('row').filter({ hasText: 'Yesterday' });
    const oneDecimal = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });
    expect(await figures.innerText()).toContain(`${oneDecimal.format(run.figures[0].windows[0].downtime!.hours)} h`);
    expect(await details.innerText()).toContain('TR1-S2: Normalized permeate flow');
    await mainText(s.page);
    await shot(s.page, 'nightly-run-details');
    await closeSession(s);
  });

  it('is open to engineers and refused to managers', async () => {
    const s = await openSession(browser);
    await signIn(s, base, 'engineer', '/nightly');
    await s.page.getByRole('row').filter({ hasText: `run ${run.id}` }).waitFor();
    await s.page.goto(`${base}/mail`);
    await s.page.getByRole('heading', { name: 'Your role does not allow this page' }).waitFor();
    await closeSession(s);
    const m = await openSession(browser);
    await signIn(m, base, 'manager', '/nightly');
    await m.page.getByRole('heading', { name: 'Your role does not allow this page' }).waitFor();
    await shot(m.page, 'nightly-refused-manager');
    await closeSession(m);
  });
});

describe('the Mail page', () => {
  it('lists the received mail and opens a digest with its HTML part in a sandboxed frame and its text part', async () => {
    const s = await openSession(browser);
    await signIn(s, base, 'admin', '/mail');
    await s.page.getByRole('heading', { level: 1, name: 'Mail' }).waitFor();
    await s.page.getByText(/Mail goes to the development mail server/).waitFor();
    await s.page.getByText(/The outbox is empty/).waitFor();
    const table = s.page.getByRole('table', { name: /Received messages/ });
    // Two digests (manager, finance) and the membrane alert to the manager (finance does not read membrane performance).
    await expect.poll(() => table.getByRole('row').count()).toBe(1 + 3);
    await shot(s.page, 'mail-admin');

    const digest = table.getByRole('row').filter({ hasText: 'manager@test.example' }).filter({ hasText: 'nightly digest' });
    await digest.getByRole('button', { name: /^Open the message/ }).click();
    const frame = s.page.locator('iframe[title^="HTML part of"]');
    await frame.waitFor();
    // Every sandbox restriction (HTML standard, the iframe sandbox attribute): no scripts, forms or same origin.
    expect(await frame.getAttribute('sandbox')).toBe('');
    const inside = s.page.frameLocator('iframe[title^="HTML part of"]');
    await inside.getByRole('heading', { name: 'Nightly digest for 2025-01-08' }).waitFor();
    expect(await inside.getByRole('table').first().innerText()).toMatch(/MTBF/);
    const text = await s.page.locator('pre').innerText();
    expect(text).toContain('Nightly digest for 2025-01-08');
    expect(text).toContain('TR1-S2');
    await shot(s.page, 'mail-digest-open');

    const alert = table.getByRole('row').filter({ hasText: 'Osmia membrane alert' });
    await alert.getByRole('button', { name: /^Open the message/ }).click();
    await s.page.frameLocator('iframe[title^="HTML part of"]').getByRole('heading', { name: /^Membrane alert: TR1-S2/ }).waitFor();
    expect(await s.page.frameLocator('iframe[title^="HTML part of"]').locator('body').innerText()).toContain('Isolate the train and release all pressure');
    await shot(s.page, 'mail-alert-open');
    await closeSession(s);
  });
});

describe('the digest subscription', () => {
  it('is a checkbox on the Settings page for oneself, and a column of the Users table for the admin', async () => {
    const s = await openSession(browser);
    await signIn(s, base, 'engineer', '/settings');
    const box = s.page.getByRole('checkbox', { name: 'Send me the nightly digest' });
    expect(await box.isChecked()).toBe(false);
    await box.check();
    await s.page.getByRole('status').filter({ hasText: 'Subscribed' }).first().waitFor();
    await s.page.reload();
    expect(await s.page.getByRole('checkbox', { name: 'Send me the nightly digest' }).isChecked()).toBe(true);
    await shot(s.page, 'settings-digest-engineer');
    await closeSession(s);

    const a = await openSession(browser);
    await signIn(a, base, 'admin', '/users');
    expect(await a.page.getByRole('checkbox', { name: 'Nightly digest for engineer@test.example' }).isChecked()).toBe(true);
    expect(await a.page.getByRole('checkbox', { name: 'Nightly digest for admin@test.example' }).isChecked()).toBe(false);
    await a.page.getByRole('checkbox', { name: 'Nightly digest for engineer@test.example' }).uncheck();
    await a.page.getByRole('status').filter({ hasText: 'no longer gets the nightly digest' }).first().waitFor();
    await shot(a.page, 'users-digest-admin');
    await closeSession(a);
  });
});
