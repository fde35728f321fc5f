// GET /api/reports, the workbook downloads and the stored workbooks: who gets which workbook, what the
// listing shows, and that a stored file is only ever one of the workbooks inside the reports folder.
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '#shared/schemas/enums.ts';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { reportListSchema } from '#shared/schemas/reports.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { binaryBody } from '../../setup/spreadsheet.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

// Which workbook each role gets, written out here independently of server/reports/catalog.ts: finance
// gets finance and manager; manager gets manager; engineer gets engineer and manager; admin all.
const expected: Record<Role, string[]> = {
  admin: ['finance', 'manager', 'engineer'],
  finance: ['finance', 'manager'],
  manager: ['manager'],
  engineer: ['manager', 'engineer'],
};

let t: TestApp;
let outside: string;
const stored = {
  finance: 'finance-OPS-2025-01-01-2025-02-01.xlsx',
  engineer: 'engineer-OPS-2025-01-01-2025-02-01.xlsx',
  manager: 'manager-OPS-2025-01-01-2025-02-01.xlsx',
};

beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
  const dir = t.env.REPORTS_DIR!;
  const day1 = join(dir, '2025-02-01');
  const day2 = join(dir, '2025-02-02');
  mkdirSync(day1, { recursive: true });
  mkdirSync(day2, { recursive: true });
  writeFileSync(join(day1, stored.finance), 'finance bytes');
  writeFileSync(join(day1, stored.engineer), 'engineer bytes');
  writeFileSync(join(day2, stored.manager), 'manager bytes');
  utimesSync(join(day2, stored.manager), new Date('2025-02-02T03:00:00Z'), new Date('2025-02-02T03:00:00Z'));
  // Not workbooks, or not where workbooks are kept: never listed.
  writeFileSync(join(day1, 'notes.txt'), 'x');
  writeFileSync(join(day1, 'finance-OPS-2025-01-01-2025-02-01.xlsx.123.partial'), 'half');
  mkdirSync(join(dir, 'misc'));
  writeFileSync(join(dir, 'misc', stored.finance), 'x');
  writeFileSync(join(dir, stored.finance), 'at the top');
  // Links that would lead out of the folder.
  outside = mkdtempSync(join(tmpdir(), 'osmia-outside-'));
  writeFileSync(join(outside, 'secret.xlsx'), 'secret');
  mkdirSync(join(outside, '2025-03-01'));
  writeFileSync(join(outside, '2025-03-01', stored.manager), 'secret too');
  symlinkSync(join(outside, 'secret.xlsx'), join(day1, 'manager-LINK-2025-01-01-2025-02-01.xlsx'));
  symlinkSync(join(outside, '2025-03-01'), join(dir, '2025-03-01'));
});
afterAll(async () => {
  await t.close();
  rmSync(outside, { recursive: true, force: true });
});

const get = (path: string, role: Role) => request(t.app).get(path).set('Cookie', t.cookies[role]);

describe('GET /api/reports', () => {
  it.each(Object.keys(expected) as Role[])('offers %s the workbooks of its role and the stored ones it may download', async (role) => {
    const res = await get('/api/reports', role);
    expect(res.status).toBe(200);
    const list = reportListSchema.parse(res.body);
    expect(list.workbooks.map((w) => w.name)).toEqual(expected[role]);
    expect(list.workbooks.map((w) => w.url)).toEqual(expected[role].map((n) => `/api/reports/${n}.xlsx`));
    // Newest folder first; only workbooks in dated folders, only those of the role.
    const files = list.stored.map((s) => `${s.date}/${s.file}`);
    const all = [`2025-02-02/${stored.manager}`, `2025-02-01/${stored.engineer}`, `2025-02-01/${stored.finance}`];
    expect(files).toEqual(all.filter((f) => expected[role].includes(f.split('/')[1]!.split('-')[0]!)));
  });

  it('describes each stored workbook: name, site, window, size, modified time and where to get it', async () => {
    const list = reportListSchema.parse((await get('/api/reports', 'manager')).body);
    expect(list.stored).toEqual([
      {
        date: '2025-02-02',
        file: stored.manager,
        name: 'manager',
        site: 'OPS',
        from: '2025-01-01',
        to: '2025-02-01',
        bytes: 'manager bytes'.length,
        modifiedAt: '2025-02-02T03:00:00.000Z',
        url: `/api/reports/stored/2025-02-02/${stored.manager}`,
      },
    ]);
  });
});

describe('GET /api/reports/<name>.xlsx', () => {
  it('admits on each workbook’s route exactly the roles of its workbook', () => {
    const routes = t.app.locals.routes.filter((r) => /^\/api\/reports\/\w+\.xlsx$/.test(r.path));
    expect(Object.fromEntries(routes.map((r) => [r.path, [...r.access].sort()]))).toEqual({
      '/api/reports/finance.xlsx': ['admin', 'finance'],
      '/api/reports/manager.xlsx': ['admin', 'engineer', 'finance', 'manager'],
      '/api/reports/engineer.xlsx': ['admin', 'engineer'],
    });
  });

  it('streams the workbook as it is written (chunked, no length known in advance)', async () => {
    const res = await get(`/api/reports/manager.xlsx?site=${SITE}&from=2025-01-01&to=2025-01-11`, 'manager').buffer(true).parse(binaryBody);
    expect(res.status).toBe(200);
    expect(res.headers['transfer-encoding']).toBe('chunked');
    expect(res.headers['content-length']).toBeUndefined();
    // An XLSX is a zip: it starts with a local file header, "PK\x03\x04".
    expect((res.body as Buffer).subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04]));
  });

  it('answers a bad window or site with a JSON error before any of the workbook', async () => {
    const badDay = await get(`/api/reports/finance.xlsx?site=${SITE}&from=2025-13-01`, 'finance');
    expect(badDay.status).toBe(400);
    const issues = (errorBodySchema.parse(badDay.body).error.details as { issues: { path: string[]; message: string }[] }).issues;
    expect(issues[0]).toMatchObject({ path: ['from'], message: expect.stringMatching(/^from must be a calendar date, YYYY-MM-DD/) });
    const empty = await get(`/api/reports/finance.xlsx?site=${SITE}&from=2025-02-01&to=2025-01-01`, 'finance');
    expect(empty.status).toBe(400);
    expect(errorBodySchema.parse(empty.body).error.code).toBe('invalid-window');
    const noSite = await get('/api/reports/finance.xlsx?site=NOPE&from=2025-01-01&to=2025-02-01', 'finance');
    expect(noSite.status).toBe(404);
    expect(errorBodySchema.parse(noSite.body).error.code).toBe('site-not-found');
  });
});

describe('GET /api/reports/stored/:date/:file', () => {
  it('hands out a stored workbook as it is on disk', async () => {
    const res = await get(`/api/reports/stored/2025-02-01/${stored.finance}`, 'finance').buffer(true).parse(binaryBody);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${stored.finance}"`);
    expect((res.body as Buffer).toString()).toBe('finance bytes');
  });

  it('refuses a stored workbook the role may not have, as its route does', async () => {
    const res = await get(`/api/reports/stored/2025-02-01/${stored.finance}`, 'engineer');
    expect(res.status).toBe(403);
    expect((await get(`/api/reports/stored/2025-02-01/${stored.engineer}`, 'finance')).status).toBe(403);
  });

  it.each([
    ['a path in the file name', `/api/reports/stored/2025-02-01/..%2F..%2Fpackage.json`],
    ['a path in the folder', `/api/reports/stored/..%2F..%2Fetc/${stored.manager}`],
    ['dots for the folder', `/api/reports/stored/%2E%2E/${stored.manager}`],
    ['a file that is not a workbook', '/api/reports/stored/2025-02-01/notes.txt'],
    ['a half-written workbook', '/api/reports/stored/2025-02-01/finance-OPS-2025-01-01-2025-02-01.xlsx.123.partial'],
    ['a folder that is not a date', `/api/reports/stored/misc/${stored.finance}`],
    ['a date that is not a day', `/api/reports/stored/2025-02-30/${stored.manager}`],
  ])('refuses %s with 400', async (_what, path) => {
    const res = await get(path, 'admin');
    expect(res.status).toBe(400);
    expect(errorBodySchema.parse(res.body).error.code).toBe('validation-failed');
  });

  it.each([
    ['a workbook that is not there', `/api/reports/stored/2025-02-09/${stored.manager}`],
    ['a link in the folder to a file outside it', '/api/reports/stored/2025-02-01/manager-LINK-2025-01-01-2025-02-01.xlsx'],
    ['a dated folder that is a link to elsewhere', `/api/reports/stored/2025-03-01/${stored.manager}`],
  ])('answers %s with 404 report-not-found', async (_what, path) => {
    const res = await get(path, 'admin');
    expect(res.status).toBe(404);
    expect(errorBodySchema.parse(res.body).error.code).toBe('report-not-found');
  });

  it('never hands out a file through a path with ".." in it', async () => {
    const res = await get(`/api/reports/stored/2025-02-01/../../../${stored.finance}`, 'admin');
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.text).not.toContain('at the top');
  });
});
