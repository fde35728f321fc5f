import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { healthSchema } from '#shared/schemas/health.ts';
import { userListSchema } from '#shared/schemas/users.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('errors have one shape and lose nothing', () => {
  it('an unknown API route is a 404 JSON body', async () => {
    const res = await request(t.app).get('/api/no-such-thing').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(404);
    expect(res.type).toBe('application/json');
    expect(errorBodySchema.parse(res.body).error.code).toBe('route-not-found');
  });

  it('a malformed JSON body is a 400 with an issue list', async () => {
    const res = await request(t.app).post('/api/users').set('Cookie', t.cookies.admin).set('Content-Type', 'application/json').send('{"email": ');
    expect(res.status).toBe(400);
    const body = errorBodySchema.parse(res.body);
    expect(body.error.code).toBe('invalid-json');
    expect((body.error.details as { issues: unknown[] }).issues.length).toBeGreaterThan(0);
  });

  it('a body that fails the schema is a 400 with the zod issues, and nothing is written', async () => {
    const before = userListSchema.parse((await request(t.app).get('/api/users').set('Cookie', t.cookies.admin)).body).users.length;
    const res = await request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'not-an-email', role: 'boss', password: 'short' });
    expect(res.status).toBe(400);
    const issues = (errorBodySchema.parse(res.body).error.details as { issues: { path: string[] }[] }).issues;
    expect(issues.map((i) => i.path[0]).sort()).toEqual(['email', 'password', 'role']);
    const after = userListSchema.parse((await request(t.app).get('/api/users').set('Cookie', t.cookies.admin)).body).users.length;
    expect(after).toBe(before);
  });

  it('a second user with the same e-mail (any case) is a 409', async () => {
    const res = await request(t.app).post('/api/users').set('Cookie', t.cookies.admin).send({ email: 'ADMIN@test.example', role: 'admin', password: 'long-enough-pw' });
    expect(res.status).toBe(409);
    expect(errorBodySchema.parse(res.body).error.code).toBe('email-taken');
  });

  it('the last active admin cannot be demoted or disabled', async () => {
    const users = userListSchema.parse((await request(t.app).get('/api/users').set('Cookie', t.cookies.admin)).body).users;
    const admin = users.find((u) => u.role === 'admin')!;
    const res = await request(t.app).patch(`/api/users/${admin.id}`).set('Cookie', t.cookies.admin).send({ role: 'manager' });
    expect(res.status).toBe(409);
    expect(errorBodySchema.parse(res.body).error.code).toBe('last-admin');
  });

  it('unknown settings are refused; known ones are validated and kept', async () => {
    const bad = await request(t.app).put('/api/settings').set('Cookie', t.cookies.admin).send({ waterValuePerM3: -1, colour: 'red' });
    expect(bad.status).toBe(400);
    const ok = await request(t.app).put('/api/settings').set('Cookie', t.cookies.admin).send({ waterValuePerM3: 1.25 });
    expect(ok.status).toBe(200);
    const read = await request(t.app).get('/api/settings').set('Cookie', t.cookies.finance);
    expect(read.body.waterValuePerM3).toBe(1.25);
    expect(read.body.alertFlowDropPct).toBe(10);
    // Changing one key leaves the others as they were (no defaults written back).
    await request(t.app).put('/api/settings').set('Cookie', t.cookies.admin).send({ currency: 'USD' }).expect(200);
    const after = await request(t.app).get('/api/settings').set('Cookie', t.cookies.admin);
    expect([after.body.currency, after.body.waterValuePerM3]).toEqual(['USD', 1.25]);
  });
});

describe('health and API description', () => {
  it('GET /api/health says the database is up, without a session', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(healthSchema.parse(res.body).database.up).toBe(true);
  });

  it('security headers are set', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('GET /api/openapi.json describes every route with its roles and schemas', async () => {
    const res = await request(t.app).get('/api/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toBe('3.0.3');
    const ops = Object.values(res.body.paths as Record<string, Record<string, { 'x-roles': unknown }>>).flatMap((p) => Object.values(p));
    expect(ops.length).toBe(t.app.locals.routes.length);
    const login = res.body.paths['/api/auth/login'].post;
    expect(login.requestBody.content['application/json'].schema.properties).toHaveProperty('password');
    expect(res.body.paths['/api/users/{id}'].patch['x-roles']).toEqual(['admin']);
  });
});
