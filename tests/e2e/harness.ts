// What the browser suites share: the client built as in production, the app listening on a free loopback
// port, Debian's Chromium started headless with the flags this closed network needs, and a session that
// signs in, fails the test on any page or unexpected console error, and takes screenshots.
import { mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { build } from 'vite';
import { expect } from 'vitest';
import type { Role } from '#shared/schemas/enums.ts';
import { rolePasswords, type TestApp } from '../setup/app.ts';

const root = fileURLToPath(new URL('../..', import.meta.url));
/** Where the suites' screenshots go (looked at by hand; not compared). */
export const shotsDir = fileURLToPath(new URL('./screenshots', import.meta.url));

/** Build the client into a fresh temp folder; returns the folder. */
export async function buildClient(): Promise<string> {
  const dist = mkdtempSync(join(tmpdir(), 'osmia-client-'));
  // vitest runs with NODE_ENV=test; the client is built as in production (React's production build).
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ root, configFile: join(root, 'vite.config.ts'), logLevel: 'warn', build: { outDir: dist, emptyOutDir: true } });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
  return dist;
}

/** Listen on 127.0.0.1 at a free port; returns the server and its base URL. */
export async function listen(app: TestApp['app']): Promise<{ server: Server; base: string }> {
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  return { server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` };
}

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless=new', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/** Close what a suite opened, in order, and remove its temp folders. */
export async function tearDown(parts: { browser?: Browser; server?: Server; t?: TestApp; dirs: (string | undefined)[] }): Promise<void> {
  await parts.browser?.close();
  if (parts.server) {
    const server = parts.server;
    await new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeAllConnections();
  }
  await parts.t?.close();
  for (const dir of parts.dirs) if (dir) rmSync(dir, { recursive: true, force: true });
}

/** An HTTP refusal a step provokes on purpose (Chromium logs each as a console error). */
export interface ExpectedFailure {
  status: number;
  path: string | RegExp;
}

/** Without a session, the client asks GET /api/auth/me and is answered 401 before it redirects. */
export const anonymousMe: ExpectedFailure = { status: 401, path: '/api/auth/me' };

export interface Session {
  context: BrowserContext;
  page: Page;
  /** Console errors and page errors so far, except the expected failures. */
  problems: () => string[];
  /** Allows these HTTP refusals until the session closes. */
  expectFailures: (...failures: ExpectedFailure[]) => void;
}

export interface SessionOptions {
  viewport?: { width: number; height: number };
  timezoneId?: string;
  acceptDownloads?: boolean;
  /** The refusals allowed from the start (besides `anonymousMe`). */
  expected?: ExpectedFailure[];
}

/** A fresh browser context (en-GB, UTC unless told) that collects page errors and unexpected console errors. */
export async function openSession(browser: Browser, options: SessionOptions = {}): Promise<Session> {
  const context = await browser.newContext({
    viewport: options.viewport ?? { width: 1280, height: 860 },
    locale: 'en-GB',
    timezoneId: options.timezoneId ?? 'UTC',
    acceptDownloads: options.acceptDownloads ?? false,
  });
  const page = await context.newPage();
  const problems: string[] = [];
  const expected: ExpectedFailure[] = [anonymousMe, ...(options.expected ?? [])];
  page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
  page.on('console', (msg) => {
    if (msg.type() !== 'error') return;
    const status = /status of (\d{3})/.exec(msg.text())?.[1];
    const url = msg.location().url ?? '';
    const path = url ? new URL(url).pathname : '';
    const allowed = expected.some((e) => String(e.status) === status && (typeof e.path === 'string' ? e.path === path : e.path.test(path)));
    if (!allowed) problems.push(`console error: ${msg.text()} (${url})`);
  });
  return { context, page, problems: () => [...problems], expectFailures: (...f) => expected.push(...f) };
}

/** Closes the session and fails the test if anything went wrong in the page. */
export async function closeSession(s: Session): Promise<void> {
  const problems = s.problems();
  await s.context.close();
  expect(problems).toEqual([]);
}

/** Fills the sign-in form and submits it. */
export async function fillSignIn(page: Page, email: string, password: string): Promise<void> {
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Opens `path` without a session, is sent to the sign-in form, signs in as the role's test user and waits to be back on `path`. */
export async function signIn(s: Session, base: string, role: Role, path: string): Promise<void> {
  await s.page.goto(`${base}${path}`);
  await s.page.waitForURL((url) => url.pathname === '/sign-in');
  await fillSignIn(s.page, `${role}@test.example`, rolePasswords[role]);
  await s.page.waitForURL((url) => url.pathname === path.split('?')[0]);
}

export async function heading(page: Page, name: string): Promise<void> {
  await page.getByRole('heading', { level: 1, name, exact: true }).waitFor();
}

/** The text of the page's main region, checked for what a broken figure would print. */
export async function mainText(page: Page): Promise<string> {
  const text = await page.getByRole('main').innerText();
  for (const bad of ['NaN', 'undefined', 'Infinity', '[object Object]', 'could not be shown', 'null']) {
    expect(text, `the page shows "${bad}"`).not.toContain(bad);
  }
  return text;
}

/** A full-page screenshot into tests/e2e/screenshots/, with no chart tooltip left open under the pointer. */
export async function shot(page: Page, name: string): Promise<void> {
  await page.mouse.move(0, 0);
  await page.screenshot({ path: join(shotsDir, `${name}.png`), fullPage: true });
}
