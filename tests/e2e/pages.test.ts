// The built client in a real browser against the real API and a test database: sign-in per role,
// the role's navigation, the users and settings pages, and no console errors. Each step leaves a
// screenshot in tests/e2e/screenshots/ (git-ignored) to look at. The database here holds no plant
// (a fresh server); kpi-pages.test.ts opens the KPI pages with the demo plant.
import { mkdirSync, readdirSync } from 'node:fs';
import type { Server } from 'node:http';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roles, type Role } from '#shared/schemas/enums.ts';
import { settingsDefaults } from '#shared/schemas/settings.ts';
import { navigationFor, pages } from '#src/config/navigation.ts';
import { buildClient, closeSession, fillSignIn, heading, launchChromium, listen, openSession, shot, shotsDir, tearDown, type ExpectedFailure, type Session } from './harness.ts';
import { createTestApp, rolePasswords, type TestApp } from '../setup/app.ts';


// The role → page table as the product brief gives it, written out here independently of
// src/config/navigation.ts so that a wrong entry there fails this test.
const all: Role[] = ['admin', 'engineer', 'manager', 'finance'];
const briefTable: Record<string, Role[]> = {
  Dashboard: all,
  Reliability: ['admin', 'engineer', 'manager'],
  'Element life & forecast': all,
  'Jobs / time to complete': ['admin', 'engineer', 'manager'],
  Downtime: all,
  'Membrane performance': ['admin', 'engineer', 'manager'],
  Imports: ['admin', 'engineer'],
  Reports: all,
  'Nightly runs': ['admin', 'engineer'],
  Users: ['admin'],
  Mail: ['admin'],
  Settings: all,
};
// Pages whose API exists today; the others stay out of the navigation and the router.
const readyLabels = Object.keys(briefTable);

let t: TestApp;
let server: Server;
let base: string;
let browser: Browser;
let dist: string;

beforeAll(async () => {
  dist = await buildClient();
  t = await createTestApp({}, { clientDist: dist });
  ({ server, base } = await listen(t.app));
  browser = await launchChromium();
  mkdirSync(shotsDir, { recursive: true });
});

afterAll(() => tearDown({ browser, server, t, dirs: [dist] }));

// With no plant in the database, every KPI endpoint and the open work orders answer 404 site-not-found
// (shown as "no plant data yet").
const noPlant: ExpectedFailure = { status: 404, path: /^\/api\/(kpi|work-orders)\// };

/** Opens the app without a session, is sent to the sign-in form, and signs in there. */
async function signIn(s: Session, role: Role, path = '/') {
  await s.page.goto(`${base}${path}`);
  await s.page.waitForURL((url) => url.pathname === '/sign-in');
  expect(new URL(s.page.url()).searchParams.get('redirectTo')).toBe(path);
  await fillSignIn(s.page, `${role}@test.example`, rolePasswords[role]);
}

async function navLabels(page: Page): Promise<string[]> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.waitFor();
  return (await nav.getByRole('link').allInnerTexts()).map((text) => text.trim());
}

async function toast(page: Page, text: string) {
  const item = page.getByRole('alert').or(page.getByRole('status')).filter({ hasText: text });
  await item.first().waitFor();
}

describe('the role → page table', () => {
  it('lists every page of the brief with the roles the brief gives it', () => {
    expect(Object.fromEntries(pages.map((p) => [p.label, [...p.roles].sort()]))).toEqual(
      Object.fromEntries(Object.entries(briefTable).map(([label, r]) => [label, [...r].sort()])),
    );
  });

  it('marks only the pages whose API exists as ready', () => {
    expect(pages.filter((p) => p.ready).map((p) => p.label)).toEqual(readyLabels);
  });

  it('gives each role the ready pages the brief allows it, in table order', () => {
    for (const role of roles) {
      const expected = Object.keys(briefTable).filter((label) => readyLabels.includes(label) && briefTable[label].includes(role));
      expect(navigationFor(role).map((p) => p.label), role).toEqual(expected);
    }
  });
});

describe('the built client in a browser', () => {
  it('builds into a folder the app serves, with the two Fira Sans weights and no other font files', () => {
    const assets = readdirSync(join(dist, 'assets'));
    expect(assets.filter((f) => /\.woff2$/.test(f)).sort()).toEqual([
      expect.stringMatching(/^fira-sans-latin-400-normal-.*\.woff2$/),
      expect.stringMatching(/^fira-sans-latin-700-normal-.*\.woff2$/),
    ]);
  });

  it('shows the sign-in form and the server’s message for a wrong password', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    s.expectFailures({ status: 401, path: '/api/auth/login' });
    await s.page.goto(`${base}/`);
    await s.page.waitForURL((url) => url.pathname === '/sign-in');
    await heading(s.page, 'Sign in');
    await s.page.keyboard.press('Tab');
    await shot(s.page, 'sign-in');

    await fillSignIn(s.page, 'admin@test.example', 'not-the-password');
    const alert = s.page.getByRole('alert').filter({ hasText: 'Not signed in' });
    await alert.waitFor();
    expect(await alert.innerText()).toContain('E-mail or password is wrong.');
    await shot(s.page, 'sign-in-wrong-password');

    // The form itself refuses an empty password before asking the server.
    await s.page.getByLabel('Password').fill('');
    await s.page.getByRole('button', { name: 'Sign in' }).click();
    await s.page.getByText('Enter your password.').waitFor();
    expect(new URL(s.page.url()).pathname).toBe('/sign-in');
    await closeSession(s);
  });

  for (const role of roles) {
    it(`signs in as ${role} through the form and shows exactly that role's navigation`, async () => {
      const s = await openSession(browser, { expected: [noPlant] });
      await signIn(s, role);
      await heading(s.page, 'Dashboard');
      // Server health is for the people who run the server and its imports.
      if (role === 'admin' || role === 'engineer') await s.page.getByText('All systems running').waitFor();
      else {
        await s.page.getByText('Downtime: no plant data yet').waitFor();
        expect(await s.page.getByRole('region', { name: 'Server health' }).count()).toBe(0);
      }
      const expected = Object.keys(briefTable).filter((label) => readyLabels.includes(label) && briefTable[label].includes(role));
      expect(await navLabels(s.page)).toEqual(expected);
      const banner = s.page.getByRole('banner');
      expect(await banner.innerText()).toContain(`${role}@test.example`);
      await shot(s.page, `dashboard-${role}`);

      // Every entry of the navigation opens its page.
      for (const label of expected) {
        await s.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: label, exact: true }).click();
        await heading(s.page, label);
        expect(await s.page.getByRole('link', { name: label, exact: true }).getAttribute('aria-current')).toBe('page');
      }
      // A ready page outside the role's table shows the refusal panel, not a blank page.
      if (!briefTable.Users.includes(role)) {
        await s.page.goto(`${base}/users`);
        await s.page.getByRole('heading', { name: 'Your role does not allow this page' }).waitFor();
        await shot(s.page, `users-refused-${role}`);
      }
      await closeSession(s);
    });
  }

  it('sends a signed-out visitor to sign-in and back to the page asked for, and signs out', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    await signIn(s, 'manager', '/settings');
    await heading(s.page, 'Settings');
    expect(new URL(s.page.url()).pathname).toBe('/settings');
    expect(await s.page.title()).toBe('Settings · Osmia');
    await s.page.getByRole('button', { name: 'Sign out' }).click();
    await heading(s.page, 'Sign in');
    expect(new URL(s.page.url()).pathname).toBe('/sign-in');
    expect(new URL(s.page.url()).searchParams.get('redirectTo')).toBeNull();
    await s.page.goto(`${base}/settings`);
    await s.page.waitForURL((url) => url.pathname === '/sign-in' && url.searchParams.get('redirectTo') === '/settings');
    await closeSession(s);
  });

  it('sends someone whose session ended while the app was open to sign in, and back', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    s.expectFailures({ status: 401, path: '/api/imports' });
    await signIn(s, 'engineer');
    await heading(s.page, 'Dashboard');
    // The session cookie goes away (as when it expires); the next request is answered 401. (The import
    // history is a request the dashboard has not made already: its settings would come from the cache.)
    await s.context.clearCookies();
    await s.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Imports' }).click();
    await s.page.waitForURL((url) => url.pathname === '/sign-in' && url.searchParams.get('redirectTo') === '/imports');
    await fillSignIn(s.page, 'engineer@test.example', rolePasswords.engineer);
    await heading(s.page, 'Imports');
    await s.page.getByText('Nothing has been imported yet.').waitFor();
    expect(new URL(s.page.url()).pathname).toBe('/imports');
    await closeSession(s);
  });

  it('shows a not-found page inside the shell for an unknown address', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    await signIn(s, 'engineer', '/no-such-page');
    await s.page.getByText('There is no page at this address').waitFor();
    // Inside the shell: the navigation is still there to leave by.
    expect(await s.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Dashboard' }).isVisible()).toBe(true);
    expect(new URL(s.page.url()).pathname).toBe('/no-such-page');
    await shot(s.page, 'not-found');
    await closeSession(s);
  });

  it('lets the admin add a user, change roles, disable and set a password, and shows the last-admin refusal', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    await signIn(s, 'admin', '/users');
    await heading(s.page, 'Users');
    const table = s.page.getByRole('table');
    for (const role of roles) await table.getByRole('row').filter({ hasText: `${role}@test.example` }).waitFor();
    await shot(s.page, 'users-admin');

    // The form checks the shared schema before it asks the server.
    const form = s.page.getByRole('region', { name: 'Add a user' });
    await form.getByLabel('E-mail').fill('new.tech@test.example');
    await form.getByLabel('Name').fill('New Technician');
    await form.getByLabel('Role').selectOption('engineer');
    await form.getByLabel('Password').fill('short');
    await form.getByRole('button', { name: 'Add user' }).click();
    await form.getByText('At least 10 characters.', { exact: true }).waitFor();
    expect(await form.getByLabel('Password').getAttribute('aria-invalid')).toBe('true');
    await shot(s.page, 'users-add-invalid');

    await form.getByLabel('Password').fill('new-tech-password-1');
    await form.getByRole('button', { name: 'Add user' }).click();
    await toast(s.page, 'User added');
    await table.getByRole('row').filter({ hasText: 'new.tech@test.example' }).waitFor();

    // The same e-mail again: the server's message lands beside the field.
    s.expectFailures({ status: 409, path: '/api/users' });
    await form.getByLabel('E-mail').fill('new.tech@test.example');
    await form.getByLabel('Password').fill('another-password-1');
    await form.getByRole('button', { name: 'Add user' }).click();
    await form.getByText('A user with this e-mail already exists.').waitFor();

    const newRole = s.page.getByLabel('Role of new.tech@test.example');
    await newRole.selectOption('manager');
    await toast(s.page, 'Role changed');
    await s.page.reload();
    await heading(s.page, 'Users');
    expect(await s.page.getByLabel('Role of new.tech@test.example').inputValue()).toBe('manager');

    // The only administrator cannot stop being one: the server refuses, the toast says why.
    s.expectFailures({ status: 409, path: /^\/api\/users\/\d+$/ });
    await s.page.getByLabel('Role of admin@test.example').selectOption('engineer');
    await toast(s.page, 'At least one active administrator must remain.');
    await expect.poll(() => s.page.getByLabel('Role of admin@test.example').inputValue()).toBe('admin');
    await shot(s.page, 'users-last-admin-refused');

    await s.page.getByRole('button', { name: 'Disable new.tech@test.example' }).click();
    await toast(s.page, 'Account disabled');
    await s.page.getByRole('button', { name: 'Enable new.tech@test.example' }).click();
    await toast(s.page, 'Account enabled');

    await s.page.getByRole('button', { name: 'Set a new password for new.tech@test.example' }).click();
    const passwordForm = s.page.getByRole('region', { name: 'New password for new.tech@test.example' });
    await passwordForm.getByLabel('New password').fill('changed-password-22');
    await passwordForm.getByRole('button', { name: 'Save password' }).click();
    await toast(s.page, 'Password changed');
    await closeSession(s);

    // The new user signs in with the new password and gets a manager's navigation.
    const other = await openSession(browser, { expected: [noPlant] });
    await other.page.goto(`${base}/`);
    await other.page.waitForURL((url) => url.pathname === '/sign-in');
    await fillSignIn(other.page, 'new.tech@test.example', 'changed-password-22');
    await heading(other.page, 'Dashboard');
    expect(await navLabels(other.page)).toEqual(Object.keys(briefTable).filter((label) => briefTable[label].includes('manager')));
    await closeSession(other);
  });

  it('lets the admin change settings, refuses a bad value, and shows them read-only to others', async () => {
    const s = await openSession(browser, { expected: [noPlant] });
    await signIn(s, 'admin', '/settings');
    await heading(s.page, 'Settings');
    expect(await s.page.getByLabel('Water value').inputValue()).toBe(String(settingsDefaults.waterValuePerM3));
    await shot(s.page, 'settings-admin');

    await s.page.getByLabel('Confidence level').fill('1.5');
    await s.page.getByRole('button', { name: 'Save settings' }).click();
    await s.page.getByText('Enter a fraction above 0.5 and below 1, such as 0.9.').waitFor();
    await shot(s.page, 'settings-admin-invalid');
    await s.page.getByLabel('Confidence level').fill('0.95');

    await s.page.getByLabel('Currency').fill('USD');
    await s.page.getByLabel('Water value').fill('1,25');
    await s.page.getByLabel('Digest recipients').fill('manager@test.example\nops@test.example');
    await s.page.getByRole('button', { name: 'Save settings' }).click();
    await toast(s.page, 'Settings saved');
    await s.page.reload();
    await heading(s.page, 'Settings');
    expect(await s.page.getByLabel('Water value').inputValue()).toBe('1.25');
    expect(await s.page.getByLabel('Currency').inputValue()).toBe('USD');
    await s.page.getByText('USD per m³').first().waitFor();
    await closeSession(s);

    const reader = await openSession(browser, { expected: [noPlant] });
    await signIn(reader, 'finance', '/settings');
    await heading(reader.page, 'Settings');
    await reader.page.getByText('Only an administrator can change these settings.').waitFor();
    expect(await reader.page.getByRole('button', { name: 'Save settings' }).count()).toBe(0);
    expect(await reader.page.getByRole('textbox').count()).toBe(0);
    const main = await reader.page.getByRole('main').innerText();
    expect(main).toContain('1.25');
    expect(main).toContain('0.95 (95 %)');
    expect(main).toContain('manager@test.example, ops@test.example');
    await shot(reader.page, 'settings-finance');
    await closeSession(reader);
  });

  it('fits a phone-sized screen: the navigation becomes a row under the top bar', async () => {
    const s = await openSession(browser, { viewport: { width: 390, height: 844 }, expected: [noPlant] });
    await signIn(s, 'admin');
    await heading(s.page, 'Dashboard');
    expect(await navLabels(s.page)).toEqual(Object.keys(briefTable));
    const overflow = await s.page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBe(0);
    await shot(s.page, 'dashboard-phone');
    await closeSession(s);
  });
});
