import { SignJWT } from 'jose';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { meSchema } from '#shared/schemas/users.ts';
import { createApp } from '#server/app.ts';
import { secretKey, sessionCookie, signSession } from '#server/auth/session.ts';
import { EnvError, loadEnv } from '#server/env.ts';
import { createUser } from '#server/services/users.ts';
import { createTestApp, testSecret, type TestApp } from '../../setup/app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ LOGIN_RATE_LIMIT: '3' });
});
afterAll(() => t.close());

const errorCode = (body: unknown) => errorBodySchema.parse(body).error.code;

describe('sign-in', () => {
  it('sets an httpOnly, SameSite session cookie with an expiry and answers the user', async () => {
    const res = await request(t.app).post('/api/auth/login').send({ email: 'Engineer@Test.example', password: 'engineer-password-1' });
    expect(res.status).toBe(200);
    expect(meSchema.parse(res.body).user.role).toBe('engineer');
    const cookie = String(res.headers['set-cookie']?.[0]);
    expect(cookie).toMatch(new RegExp(`^${sessionCookie}=`));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    expect(cookie).toMatch(/Max-Age=\d+/i);
  });

  it('answers 401 with a message for a wrong password, and the same for an unknown e-mail', async () => {
    const wrong = await request(t.app).post('/api/auth/login').send({ email: 'admin@test.example', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(errorBodySchema.parse(wrong.body).error).toMatchObject({ code: 'invalid-credentials', message: expect.stringMatching(/wrong/) });
    const unknown = await request(t.app).post('/api/auth/login').send({ email: 'nobody@test.example', password: 'whatever-123' });
    expect(unknown.status).toBe(401);
    expect(errorCode(unknown.body)).toBe('invalid-credentials');
  });

  it('rate-limits failed attempts for one address and e-mail with 429', async () => {
    const attempt = () => request(t.app).post('/api/auth/login').send({ email: 'finance@test.example', password: 'bad-password' });
    const statuses = [];
    for (let i = 0; i < 5; i++) statuses.push((await attempt()).status);
    expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
    expect(statuses.slice(3)).toEqual([429, 429]);
    const limited = await attempt();
    expect(errorCode(limited.body)).toBe('too-many-attempts');
  });

  it('GET /api/auth/me answers the signed-in user, and 401 without a cookie', async () => {
    const me = await request(t.app).get('/api/auth/me').set('Cookie', t.cookies.manager);
    expect(me.status).toBe(200);
    expect(meSchema.parse(me.body).user.email).toBe('manager@test.example');
    const anonymous = await request(t.app).get('/api/auth/me');
    expect(anonymous.status).toBe(401);
    expect(errorCode(anonymous.body)).toBe('unauthenticated');
  });

  it('refuses an expired token and a tampered token with 401 session-expired', async () => {
    const key = secretKey(testSecret);
    const expired = await new SignJWT({ role: 'admin' })
      .setProtectedHeader({ alg: 'HS256' })
      .setSubject('1')
      .setIssuer('osmia')
      .setIssuedAt(Math.floor(Date.now() / 1000) - 7200)
      .setExpirationTime(Math.floor(Date.now() / 1000) - 3600)
      .sign(key);
    const res1 = await request(t.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${expired}`);
    expect(res1.status).toBe(401);
    expect(errorCode(res1.body)).toBe('session-expired');

    const good = await signSession({ userId: 1, role: 'admin', generation: 0 }, key, 1);
    const [h, p, s] = good.split('.');
    const forgedPayload = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(p, 'base64url').toString()), sub: '2' })).toString('base64url');
    const res2 = await request(t.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${h}.${forgedPayload}.${s}`);
    expect(res2.status).toBe(401);
    const otherKey = await signSession({ userId: 1, role: 'admin', generation: 0 }, secretKey('another-secret-another-secret-another'), 1);
    const res3 = await request(t.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${otherKey}`);
    expect(res3.status).toBe(401);
  });

  it('sign-out clears the cookie', async () => {
    const login = await request(t.app).post('/api/auth/login').send({ email: 'admin@test.example', password: 'admin-password-1' });
    const cookie = String(login.headers['set-cookie']?.[0]).split(';')[0];
    const res = await request(t.app).post('/api/auth/logout').set('Cookie', cookie);
    expect(res.status).toBe(204);
    expect(String(res.headers['set-cookie']?.[0])).toMatch(new RegExp(`${sessionCookie}=;`));
    // Signing out ends every session of the user, the shared test cookie too: take a new one.
    const again = await request(t.app).post('/api/auth/login').send({ email: 'admin@test.example', password: 'admin-password-1' });
    t.cookies.admin = String(again.headers['set-cookie']?.[0]).split(';')[0];
  });

  it('a disabled user can no longer use an existing session', async () => {
    const list = await request(t.app).get('/api/users').set('Cookie', t.cookies.admin);
    const finance = list.body.users.find((u: { role: string }) => u.role === 'finance');
    await request(t.app).patch(`/api/users/${finance.id}`).set('Cookie', t.cookies.admin).send({ disabled: true }).expect(200);
    const res = await request(t.app).get('/api/auth/me').set('Cookie', t.cookies.finance);
    expect(res.status).toBe(401);
    expect(errorCode(res.body)).toBe('account-disabled');
    await request(t.app).patch(`/api/users/${finance.id}`).set('Cookie', t.cookies.admin).send({ disabled: false }).expect(200);
  });
});

const bad = (email: string) => request(t.app).post('/api/auth/login').send({ email, password: 'not-the-password' });

describe('sign-in rate limit', () => {
  beforeAll(async () => {
    for (const n of [1, 2, 3, 4]) {
      await createUser(t.db, { email: `limit${n}@test.example`, name: '', role: 'finance', password: `limit-password-${n}` }, 4);
    }
  });

  it('counts an e-mail with padding and other letter case as the same e-mail', async () => {
    const statuses = [];
    for (const email of ['limit1@test.example', '  limit1@test.example', 'LIMIT1@Test.Example\t', ' Limit1@test.example ']) statuses.push((await bad(email)).status);
    expect(statuses).toEqual([401, 401, 401, 429]);
  });

  it('a padded address does not sign in while the bare one is limited', async () => {
    for (let i = 0; i < 3; i++) expect((await bad('limit2@test.example')).status).toBe(401);
    const padded = await request(t.app).post('/api/auth/login').send({ email: '   limit2@test.example  ', password: 'limit-password-2' });
    expect(padded.status).toBe(429);
    expect(errorCode(padded.body)).toBe('too-many-attempts');
  });

  it('believes no X-Forwarded-For header while TRUST_PROXY is off: a client cannot choose its address', async () => {
    const statuses = [];
    for (let i = 0; i < 4; i++) {
      const res = await request(t.app).post('/api/auth/login').set('X-Forwarded-For', `203.0.113.${i + 1}`).send({ email: 'limit3@test.example', password: 'wrong-one' });
      statuses.push(res.status);
    }
    expect(statuses).toEqual([401, 401, 401, 429]);
  });

  it('counts only wrong passwords: refused input takes nothing from the allowance', async () => {
    for (let i = 0; i < 5; i++) {
      const res = await request(t.app).post('/api/auth/login').send({ email: 'limit4@test.example', password: '' });
      expect(res.status).toBe(400);
    }
    const ok = await request(t.app).post('/api/auth/login').send({ email: 'limit4@test.example', password: 'limit-password-4' });
    expect(ok.status).toBe(200);
    expect([(await bad('limit4@test.example')).status, (await bad('limit4@test.example')).status]).toEqual([401, 401]);
  });
});

describe('TRUST_PROXY', () => {
  const env = (value: string) =>
    loadEnv({ NODE_ENV: 'test', DATABASE_URL: 'postgres://x@127.0.0.1/x', JWT_SECRET: testSecret, TRUST_PROXY: value });

  it('is off by default and takes hop counts or proxy addresses; "true" and nonsense are refused', () => {
    expect(loadEnv({ NODE_ENV: 'test', DATABASE_URL: 'postgres://x@127.0.0.1/x', JWT_SECRET: testSecret }).TRUST_PROXY).toBe(false);
    expect(env('off').TRUST_PROXY).toBe(false);
    expect(env('1').TRUST_PROXY).toBe(1);
    expect(env('loopback, 10.0.0.0/8,192.0.2.7').TRUST_PROXY).toEqual(['loopback', '10.0.0.0/8', '192.0.2.7']);
    for (const v of ['true', 'yes', 'proxy.example', '10.0.0.0/33']) expect(() => env(v), v).toThrow(EnvError);
  });

  it('behind a trusted proxy: the forwarded address keys the limit, and HTTPS makes the cookie Secure', async () => {
    const proxied = createApp(
      { db: t.db, env: loadEnv({ NODE_ENV: 'test', DATABASE_URL: t.url, JWT_SECRET: testSecret, LOGIN_RATE_LIMIT: '2', KPI_WARM_SECONDS: '0', TRUST_PROXY: 'loopback' }), sessionKey: secretKey(testSecret) },
      { log: () => {} },
    );
    const from = (address: string) =>
      request(proxied).post('/api/auth/login').set('X-Forwarded-For', address).send({ email: 'limit1@test.example', password: 'wrong-again' });
    expect([(await from('198.51.100.1')).status, (await from('198.51.100.1')).status, (await from('198.51.100.1')).status]).toEqual([401, 401, 429]);
    expect((await from('198.51.100.2')).status).toBe(401);

    const https = await request(proxied).post('/api/auth/login').set('X-Forwarded-For', '198.51.100.3').set('X-Forwarded-Proto', 'https').send({ email: 'engineer@test.example', password: 'engineer-password-1' });
    expect(https.status).toBe(200);
    expect(String(https.headers['set-cookie']?.[0])).toMatch(/;\s*Secure/i);
    const http = await request(proxied).post('/api/auth/login').set('X-Forwarded-For', '198.51.100.3').send({ email: 'engineer@test.example', password: 'engineer-password-1' });
    expect(String(http.headers['set-cookie']?.[0])).not.toMatch(/;\s*Secure/i);
    // Without a trusted proxy the header says nothing: no Secure over plain HTTP.
    const direct = await request(t.app).post('/api/auth/login').set('X-Forwarded-Proto', 'https').send({ email: 'engineer@test.example', password: 'engineer-password-1' });
    expect(String(direct.headers['set-cookie']?.[0])).not.toMatch(/;\s*Secure/i);
  });
});
