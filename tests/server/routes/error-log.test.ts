// What reaches the server log when a user write fails in the database: the request id, the SQL and
// PostgreSQL's code, never the query's parameters (the password hash, the password, the row).
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { createApp } from '#server/app.ts';
import { secretKey } from '#server/auth/session.ts';
import { describeErrorForLog } from '#server/db/errors.ts';
import { createTestApp, testSecret, type TestApp } from '../../setup/app.ts';

let t: TestApp;
let app: ReturnType<typeof createApp>;
const logged: string[] = [];
const bcryptHash = /\$2[aby]\$\d\d\$[./A-Za-z0-9]{20,}/;

beforeAll(async () => {
  t = await createTestApp();
  app = createApp({ db: t.db, env: t.env, sessionKey: secretKey(testSecret) }, { log: (line) => logged.push(line) });
  // A rule of this test database only, so a user write fails in PostgreSQL after the schema passed it.
  await t.db.$client.query(`alter table users add constraint test_refused_name check (name <> 'Refused Name')`);
});
afterAll(() => t.close());

describe('server log of a failed user write', () => {
  it('POST /api/users: 500, and the log has the request id and the SQL but no hash or password', async () => {
    logged.length = 0;
    const password = 'secret-password-on-create';
    const res = await request(app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'refused@test.example', name: 'Refused Name', role: 'engineer', password });
    expect(res.status).toBe(500);
    expect(errorBodySchema.parse(res.body).error.code).toBe('internal-error');
    const log = logged.join('\n');
    expect(log).toContain(String(res.headers['x-request-id']));
    expect(log).toMatch(/insert into "users"/);
    expect(log).toContain('constraint=test_refused_name');
    expect(log).toContain('parameters not logged');
    expect(log).not.toMatch(bcryptHash);
    expect(log).not.toContain(password);
    expect(log).not.toContain('refused@test.example');
    // Nothing was written.
    expect((await t.db.$client.query(`select count(*)::int as n from users where email = 'refused@test.example'`)).rows[0].n).toBe(0);
  });

  it('PATCH /api/users/:id with a new password: the same, and the old password still signs in', async () => {
    logged.length = 0;
    const { rows } = await t.db.$client.query<{ id: number }>(`select id from users where email = 'finance@test.example'`);
    const password = 'secret-password-on-update';
    const res = await request(app).patch(`/api/users/${rows[0].id}`).set('Cookie', t.cookies.admin).send({ name: 'Refused Name', password });
    expect(res.status).toBe(500);
    const log = logged.join('\n');
    expect(log).toMatch(/update "users"/);
    expect(log).not.toMatch(bcryptHash);
    expect(log).not.toContain(password);
    expect((await request(app).post('/api/auth/login').send({ email: 'finance@test.example', password: 'finance-password-1' })).status).toBe(200);
  });

  it('a NUL byte in a name is a 400 naming the field, before any write', async () => {
    logged.length = 0;
    const res = await request(app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'nul@test.example', name: 'A\u0000B', role: 'engineer', password: 'long-enough-pw' });
    expect(res.status).toBe(400);
    const issues = (errorBodySchema.parse(res.body).error.details as { issues: { path: string[]; message: string }[] }).issues;
    expect(issues).toEqual([expect.objectContaining({ path: ['name'], message: expect.stringMatching(/control characters/) })]);
    expect(logged).toEqual([]);
  });

  it('describes any error without a query parameter or the DETAIL that quotes the failing row', async () => {
    const err = await t.db.$client
      .query(`insert into users (email, password_hash, role, name) values ($1, $2, 'engineer', 'Refused Name')`, ['p@test.example', '$2a$04$abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUV'])
      .then(
        () => undefined,
        (e: unknown) => e as Error & { detail?: string },
      );
    expect(err?.detail).toMatch(/Failing row contains/);
    const text = describeErrorForLog(err);
    expect(text).toContain('code=23514');
    expect(text).not.toMatch(bcryptHash);
    expect(text).not.toContain('p@test.example');
  });
});
