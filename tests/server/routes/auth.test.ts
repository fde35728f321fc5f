import { SignJWT } from 'jose';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { meSchema } from '#shared/schemas/users.ts';
import { secretKey, sessionCookie, signSession } from '#server/auth/session.ts';
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

    const good = await signSession({ userId: 1, role: 'admin' }, key, 1);
    const [h, p, s] = good.split('.');
    const forgedPayload = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(p, 'base64url').toString()), sub: '2' })).toString('base64url');
    const res2 = await request(t.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${h}.${forgedPayload}.${s}`);
    expect(res2.status).toBe(401);
    const otherKey = await signSession({ userId: 1, role: 'admin' }, secretKey('another-secret-another-secret-another'), 1);
    const res3 = await request(t.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${otherKey}`);
    expect(res3.status).toBe(401);
  });

  it('sign-out clears the cookie', async () => {
    const res = await request(t.app).post('/api/auth/logout').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(204);
    expect(String(res.headers['set-cookie']?.[0])).toMatch(new RegExp(`${sessionCookie}=;`));
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
