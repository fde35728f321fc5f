// With the database unreachable the server answers 503 database-unavailable (not 500), health keeps
// its public body free of the driver's message, and sign-in attempts that could not be checked do
// not count against the rate limit. "Down" is a real connection refused: a pool pointed at a port
// nothing listens on; and the real cluster ending this database's connections (57P01).
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { healthSchema } from '#shared/schemas/health.ts';
import { createApp } from '#server/app.ts';
import { secretKey } from '#server/auth/session.ts';
import { closeDb, createDb, type Db } from '#server/db/client.ts';
import { freePort } from '#server/db/cluster.ts';
import { isDatabaseUnavailable } from '#server/db/errors.ts';
import { loadEnv } from '#server/env.ts';
import { createTestApp, testSecret, type TestApp } from '../../setup/app.ts';

let t: TestApp;
let downDb: Db;
let down: ReturnType<typeof createApp>;
let closedPort: number;
const logged: string[] = [];

beforeAll(async () => {
  t = await createTestApp();
  closedPort = await freePort();
  const url = new URL(t.url);
  url.port = String(closedPort);
  downDb = createDb(url.toString(), { connectionTimeoutMillis: 2000 });
  const env = loadEnv({ NODE_ENV: 'test', DATABASE_URL: url.toString(), JWT_SECRET: testSecret, LOGIN_RATE_LIMIT: '2', KPI_WARM_SECONDS: '0' });
  // Same secret: the session cookies of the working app are valid tokens here too.
  down = createApp({ db: downDb, env, sessionKey: secretKey(testSecret) }, { log: (line) => logged.push(line) });
});
afterAll(async () => {
  await closeDb(downDb);
  await t.close();
});

const code = (res: request.Response) => errorBodySchema.parse(res.body).error.code;

describe('database unreachable', () => {
  it('health answers 503 with or without a session, and its body names no host, port or driver error', async () => {
    for (const cookie of [undefined, t.cookies.admin, t.cookies.finance]) {
      const req = request(down).get('/api/health');
      const res = await (cookie ? req.set('Cookie', cookie) : req);
      expect(res.status).toBe(503);
      const health = healthSchema.parse(res.body);
      expect(health).toMatchObject({ status: 'degraded', database: { up: false, latencyMs: null } });
      const text = JSON.stringify(res.body);
      expect(text).not.toContain(String(closedPort));
      expect(text).not.toMatch(/ECONNREFUSED|127\.0\.0\.1|connect /);
    }
  });

  it('signed-in requests answer 503 database-unavailable, not 500', async () => {
    for (const [path, cookie] of [
      ['/api/auth/me', t.cookies.manager],
      ['/api/users', t.cookies.admin],
      ['/api/kpi/reliability', t.cookies.engineer],
      ['/api/imports', t.cookies.engineer],
      ['/api/settings', t.cookies.finance],
    ] as const) {
      const res = await request(down).get(path).set('Cookie', cookie);
      expect(res.status, path).toBe(503);
      expect(code(res), path).toBe('database-unavailable');
      expect(errorBodySchema.parse(res.body).error.message).toMatch(/database cannot be reached/);
      expect(res.headers['retry-after']).toBe('30');
    }
    // Without a session the guarded routes still say who may enter, as before.
    expect((await request(down).get('/api/users')).status).toBe(401);
  });

  it('sign-in answers 503 and the attempts that could not be checked do not count against the limit', async () => {
    const statuses = [];
    for (let i = 0; i < 5; i++) statuses.push((await request(down).post('/api/auth/login').send({ email: 'admin@test.example', password: 'admin-password-1' })).status);
    expect(statuses).toEqual([503, 503, 503, 503, 503]);
  });

  it('logs one line per outage answer, naming the cause', () => {
    expect(logged.length).toBeGreaterThan(0);
    expect(logged.every((l) => l.includes('database unavailable') && l.includes('ECONNREFUSED'))).toBe(true);
  });
});

describe('connections ended by the server', () => {
  it('a query cut by pg_terminate_backend is recognised (57P01), a constraint violation is not', async () => {
    const client = await t.db.$client.connect();
    client.on('error', () => {});
    try {
      const pid = (await client.query<{ pid: number }>('select pg_backend_pid() as pid')).rows[0].pid;
      const sleeping = client.query('select pg_sleep(30)').then(
        () => undefined,
        (err: unknown) => err,
      );
      await new Promise((r) => setTimeout(r, 100));
      await t.db.$client.query('select pg_terminate_backend($1)', [pid]);
      const err = (await sleeping) as { code?: string };
      expect(err.code).toBe('57P01');
      expect(isDatabaseUnavailable(err)).toBe(true);
    } finally {
      client.release(true);
    }
    const violation = await t.db.$client.query(`insert into users (email, password_hash, role) values ('x@y', 'h', 'nobody')`).then(
      () => undefined,
      (err: unknown) => err,
    );
    expect((violation as { code?: string }).code).toBe('23514');
    expect(isDatabaseUnavailable(violation)).toBe(false);
  });

  it('after every connection of the database is ended, the app answers again without a restart', async () => {
    await request(t.app).get('/api/health').expect(200);
    const killer = createDb(t.url, { max: 1 });
    try {
      await killer.$client.query('select pg_terminate_backend(pid) from pg_stat_activity where datname = current_database() and pid <> pg_backend_pid()');
    } finally {
      await closeDb(killer);
    }
    await new Promise((r) => setTimeout(r, 200));
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await request(t.app).get('/api/auth/me').set('Cookie', t.cookies.admin)).status);
    // A request that met a connection as it was cut may answer 503; the next ones are served.
    expect(statuses.every((s) => s === 200 || s === 503)).toBe(true);
    expect(statuses.at(-1)).toBe(200);
  });
});
