// Malformed input never makes the server fail: every KPI endpoint gets a few dozen bad queries and
// answers each with a 4xx in the one error body shape (or, for a parameter it does not take, a normal
// answer); NUL bytes and other control characters are refused at the schema in every text field.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { kpiCatalog } from '#server/services/kpi-catalog.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { seedPlant } from '../importers/helpers.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await seedPlant(t.db, 'MAL', 'Europe/Berlin');
});
afterAll(() => t.close());

const malformed: [string, string][] = [
  ['bad calendar date', 'from=2025-13-45'],
  ['bad date-time', 'from=2025-02-30T25:61'],
  ['not a date', 'to=yesterday'],
  ['from after to', 'from=2026-01-02&to=2026-01-01'],
  ['from equal to to', 'from=2026-01-01T00:00:00Z&to=2026-01-01T00:00:00Z'],
  ['year zero', 'from=0000-01-01&to=0001-01-01'],
  ['far future', 'from=9999-12-30&to=9999-12-31T23:59:59Z'],
  ['offset out of range', 'from=2025-01-01T00:00:00+25:00'],
  ['confidence just below 1', 'confidence=0.9999999999999999'],
  ['confidence 1', 'confidence=1'],
  ['confidence huge', 'confidence=1e308'],
  ['confidence negative', 'confidence=-0.5'],
  ['confidence NaN', 'confidence=NaN'],
  ['confidence Infinity', 'confidence=Infinity'],
  ['confidence text', 'confidence=high'],
  ['months huge', 'months=99999999999999999999'],
  ['months fraction', 'months=1.5'],
  ['NUL in site', 'site=MAL%00'],
  ['NUL in asset', 'site=MAL&asset=TR1%00'],
  ['escape sequence in site', 'site=%1B%5B31mMAL'],
  ['line break in asset', 'site=MAL&asset=TR1%0A'],
  ['site twice (array)', 'site=MAL&site=OTHER'],
  ['array syntax', 'from[]=2025-01-01'],
  ['object syntax', 'site[code]=MAL'],
  ['unknown groupBy', 'site=MAL&groupBy=everything'],
  ['unknown detail', 'site=MAL&detail=everything'],
  ['unknown feedBrineAverage', 'site=MAL&feedBrineAverage=median'],
  ['renewal not a boolean', 'site=MAL&renewal=maybe'],
  ['cancelledPmCountsAsMissed not a boolean', 'site=MAL&cancelledPmCountsAsMissed=2'],
  ['unknown site', 'site=NOPE'],
  ['unknown asset', 'site=MAL&asset=NOPE'],
  ['SQL-looking site', `site=${encodeURIComponent("' OR 1=1 --")}`],
  ['SQL-looking asset', `site=MAL&asset=${encodeURIComponent("x'; drop table users; --")}`],
  ['very long site', `site=${'A'.repeat(5000)}`],
  ['empty site', 'site='],
  ['emoji site', 'site=%F0%9F%92%A5'],
  ['broken percent-encoding', 'site=%E0%A4%A'],
  ['many parameters', Array.from({ length: 500 }, (_, i) => `p${i}=x`).join('&')],
];

describe('KPI endpoints and malformed queries', () => {
  for (const kpi of kpiCatalog) {
    it(`GET /api/kpi/${kpi.name}: no 5xx, and every refusal has the one error body`, async () => {
      const problems: string[] = [];
      for (const [label, query] of malformed) {
        const res = await request(t.app).get(`/api/kpi/${kpi.name}?${query}`).set('Cookie', t.cookies.admin);
        if (res.status >= 500) problems.push(`${label}: ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
        else if (res.status >= 400 && !errorBodySchema.safeParse(res.body).success) problems.push(`${label}: ${res.status} without the error body`);
      }
      expect(problems).toEqual([]);
    });
  }

  it('refuses the clearly wrong queries with 400 on every endpoint', async () => {
    const mustBe400 = ['bad calendar date', 'not a date', 'from after to', 'confidence just below 1', 'confidence 1', 'confidence huge', 'confidence NaN', 'NUL in site', 'NUL in asset', 'escape sequence in site', 'site twice (array)', 'very long site'];
    const wrong: string[] = [];
    for (const kpi of kpiCatalog) {
      for (const [label, query] of malformed.filter(([l]) => mustBe400.includes(l))) {
        const res = await request(t.app).get(`/api/kpi/${kpi.name}?${query}`).set('Cookie', t.cookies.admin);
        if (res.status !== 400) wrong.push(`${kpi.name} ${label}: ${res.status}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('confidence is bounded to 0.5 … 0.999 on reliability, element life and forecast, and the bounds themselves are answered', async () => {
    for (const name of ['reliability', 'element-life', 'forecast']) {
      const res = await request(t.app).get(`/api/kpi/${name}?site=MAL&confidence=0.9999999999999999`).set('Cookie', t.cookies.admin);
      expect(res.status, name).toBe(400);
      const issues = (errorBodySchema.parse(res.body).error.details as { issues: { path: string[]; message: string }[] }).issues;
      expect(issues[0]).toMatchObject({ path: ['confidence'], message: expect.stringMatching(/0\.5 to 0\.999/) });
      for (const c of ['0.5', '0.999']) expect((await request(t.app).get(`/api/kpi/${name}?site=MAL&confidence=${c}`).set('Cookie', t.cookies.admin)).status, `${name} ${c}`).toBe(200);
    }
  });
});

describe('import ids and time zones', () => {
  it('an import id beyond the id column is a 400, not a 500', async () => {
    for (const path of ['/api/imports/99999999999', '/api/imports/99999999999/rejects.csv', '/api/imports/2147483648']) {
      const res = await request(t.app).get(path).set('Cookie', t.cookies.engineer);
      expect(res.status, path).toBe(400);
      expect(errorBodySchema.parse(res.body).error.code).toBe('validation-failed');
    }
    expect((await request(t.app).get('/api/imports/2147483647').set('Cookie', t.cookies.engineer)).status).toBe(404);
    expect((await request(t.app).patch('/api/users/99999999999').set('Cookie', t.cookies.admin).send({ name: 'x' })).status).toBe(400);
  });

  it('an unknown time zone on upload is a 400 and leaves no import record', async () => {
    const before = (await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n;
    const res = await request(t.app)
      .post('/api/imports')
      .set('Cookie', t.cookies.engineer)
      .field('kind', 'assets')
      .field('site', 'MARS')
      .field('tz', 'Mars/Olympus')
      .attach('file', Buffer.from('code,name,kind\nX1,X,pump\n'), 'assets.csv');
    expect(res.status).toBe(400);
    const issues = (errorBodySchema.parse(res.body).error.details as { issues: { path: string[]; message: string }[] }).issues;
    expect(issues[0]).toMatchObject({ path: ['tz'], message: expect.stringMatching(/unknown time zone "Mars\/Olympus"/) });
    expect((await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n).toBe(before);
    expect((await t.db.$client.query(`select count(*)::int as n from sites where code = 'MARS'`)).rows[0].n).toBe(0);
  });
});

describe('control characters in text fields', () => {
  const upload = (fields: Record<string, string>, fileName = 'assets.csv') => {
    const req = request(t.app).post('/api/imports').set('Cookie', t.cookies.engineer);
    for (const [k, v] of Object.entries({ kind: 'assets', site: 'MAL', ...fields })) req.field(k, v);
    return req.attach('file', Buffer.from('code,name,kind\nQ1,Q,pump\n'), fileName);
  };
  /** A multipart body written by hand, for a Content-Disposition no client library writes. */
  const rawUpload = (disposition: string) => {
    const boundary = 'osmia-test-boundary';
    const body = [
      `--${boundary}`,
      'Content-Disposition: form-data; name="kind"',
      '',
      'assets',
      `--${boundary}`,
      `Content-Disposition: form-data; name="file"; ${disposition}`,
      'Content-Type: text/csv',
      '',
      'code,name,kind\nQ1,Q,pump',
      `--${boundary}--`,
      '',
    ].join('\r\n');
    return request(t.app).post('/api/imports').set('Cookie', t.cookies.engineer).set('Content-Type', `multipart/form-data; boundary=${boundary}`).send(body);
  };
  const cases: [string, () => request.Test, string][] = [
    ['user e-mail', () => request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'a\u0000@test.example', role: 'engineer', password: 'long-enough-pw' }), 'email'],
    ['user name', () => request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'cc@test.example', name: 'Bell\u0007', role: 'engineer', password: 'long-enough-pw' }), 'name'],
    ['user name, inner line break', () => request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'cc@test.example', name: 'Two\nLines', role: 'engineer', password: 'long-enough-pw' }), 'name'],
    ['user password', () => request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'cc@test.example', role: 'engineer', password: 'long-enough\u0000pw' }), 'password'],
    ['changed name', () => request(t.app).patch('/api/users/1').set('Cookie', t.cookies.admin).send({ name: 'x\u0000' }), 'name'],
    ['sign-in e-mail', () => request(t.app).post('/api/auth/login').send({ email: 'admin@test.example\u0000', password: 'admin-password-1' }), 'email'],
    ['sign-in password', () => request(t.app).post('/api/auth/login').send({ email: 'admin@test.example', password: 'admin-password-1\u0000' }), 'password'],
    ['currency setting', () => request(t.app).put('/api/settings').set('Cookie', t.cookies.admin).send({ currency: 'EU\u0000' }), 'currency'],
    ['digest recipient', () => request(t.app).put('/api/settings').set('Cookie', t.cookies.admin).send({ digestRecipients: ['a\u0000@b.example'] }), 'digestRecipients'],
    ['upload site', () => upload({ site: 'MAL\u0000' }), 'site'],
    ['upload tz', () => upload({ tz: 'UTC\u0000' }), 'tz'],
    ['upload column map', () => upload({ map: '{"co\u0000de": "code"}' }), 'map'],
    ['upload file name', () => rawUpload(`filename*=UTF-8''assets%00.csv`), 'fileName'],
  ];

  it.each(cases)('%s: 400 naming the field, nothing written', async (_label, send, field) => {
    const before = (await t.db.$client.query('select (select count(*) from users)::int as users, (select count(*) from imports)::int as imports')).rows[0];
    const res = await send();
    expect(res.status).toBe(400);
    const body = errorBodySchema.parse(res.body);
    expect(body.error.code).toBe('validation-failed');
    const issues = (body.error.details as { issues: { path: (string | number)[]; message: string }[] }).issues;
    expect(issues.map((i) => i.path[0])).toContain(field);
    expect(issues.find((i) => i.path[0] === field)?.message).toMatch(/control characters/);
    const after = (await t.db.$client.query('select (select count(*) from users)::int as users, (select count(*) from imports)::int as imports')).rows[0];
    expect(after).toEqual(before);
  });

  it('a control character in a multipart header is a 400 bad-request, not a 500', async () => {
    const res = await rawUpload('filename="assets\u001b.csv"');
    expect(res.status).toBe(400);
    expect(errorBodySchema.parse(res.body).error).toMatchObject({ code: 'bad-request', message: expect.stringMatching(/malformed/) });
  });

  it('a tab or line break around a code or e-mail is trimmed, not refused', async () => {
    const res = await request(t.app).get('/api/kpi/downtime?site=%09MAL%0A').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(200);
    const login = await request(t.app).post('/api/auth/login').send({ email: '\tengineer@test.example\n', password: 'engineer-password-1' });
    expect(login.status).toBe(200);
  });
});
