// Sessions end when they should: sign-out, a new password, another role and disabling end every
// earlier token of the user at once, not when the token expires.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { meSchema, userSchema } from '#shared/schemas/users.ts';
import { createUser } from '#server/services/users.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

const cookieOf = (res: request.Response) => String(res.headers['set-cookie']?.[0] ?? '').split(';')[0];
const signIn = async (email: string, password: string) => {
  const res = await request(t.app).post('/api/auth/login').send({ email, password });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return cookieOf(res);
};
const me = (cookie: string) => request(t.app).get('/api/auth/me').set('Cookie', cookie);
const codeOf = (res: request.Response) => errorBodySchema.parse(res.body).error.code;

let n = 0;
async function newUser(role: 'engineer' | 'admin' = 'engineer') {
  const email = `session-${++n}@test.example`;
  const password = `session-password-${n}`;
  const user = await createUser(t.db, { email, name: '', role, password }, 4);
  return { ...user, password };
}

describe('sessions end early', () => {
  it('after sign-out the old token is refused, on every device of the user', async () => {
    const u = await newUser();
    const laptop = await signIn(u.email, u.password);
    const phone = await signIn(u.email, u.password);
    expect((await me(laptop)).status).toBe(200);
    expect((await request(t.app).post('/api/auth/logout').set('Cookie', laptop)).status).toBe(204);
    for (const cookie of [laptop, phone]) {
      const res = await me(cookie);
      expect(res.status).toBe(401);
      expect(codeOf(res)).toBe('session-expired');
    }
    // Signing in again works, and sign-out without a session is still a 204.
    expect((await me(await signIn(u.email, u.password))).status).toBe(200);
    expect((await request(t.app).post('/api/auth/logout')).status).toBe(204);
  });

  it('a password change ends the earlier sessions; the new password signs in', async () => {
    const u = await newUser();
    const before = await signIn(u.email, u.password);
    const res = await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ password: 'a-brand-new-password' });
    expect(res.status).toBe(200);
    expect(codeOf(await me(before))).toBe('session-expired');
    expect((await me(await signIn(u.email, 'a-brand-new-password'))).status).toBe(200);
  });

  it('a role change ends the earlier sessions; a name change does not', async () => {
    const u = await newUser();
    const cookie = await signIn(u.email, u.password);
    await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ name: 'Renamed' }).expect(200);
    expect(meSchema.parse((await me(cookie)).body).user.name).toBe('Renamed');
    // The same role again changes nothing either.
    await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ role: 'engineer' }).expect(200);
    expect((await me(cookie)).status).toBe(200);
    await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ role: 'finance' }).expect(200);
    expect(codeOf(await me(cookie))).toBe('session-expired');
  });

  it('disabling ends the sessions for good: re-enabling does not bring the old token back', async () => {
    const u = await newUser();
    const cookie = await signIn(u.email, u.password);
    await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ disabled: true }).expect(200);
    expect(codeOf(await me(cookie))).toBe('account-disabled');
    await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', t.cookies.admin).send({ disabled: false }).expect(200);
    expect(codeOf(await me(cookie))).toBe('session-expired');
  });

  it('an admin who changes their own password stays signed in here, on a new cookie; their other sessions end', async () => {
    const u = await newUser('admin');
    const here = await signIn(u.email, u.password);
    const elsewhere = await signIn(u.email, u.password);
    const res = await request(t.app).patch(`/api/users/${u.id}`).set('Cookie', here).send({ password: 'admin-new-password-9' });
    expect(res.status).toBe(200);
    expect(userSchema.parse(res.body).email).toBe(u.email);
    const renewed = cookieOf(res);
    expect(renewed).not.toBe(here);
    expect((await me(renewed)).status).toBe(200);
    expect(codeOf(await me(here))).toBe('session-expired');
    expect(codeOf(await me(elsewhere))).toBe('session-expired');
  });

  it('the seeded role sessions are untouched by other users signing out', async () => {
    expect((await me(t.cookies.engineer)).status).toBe(200);
    expect((await me(t.cookies.admin)).status).toBe(200);
  });
});
