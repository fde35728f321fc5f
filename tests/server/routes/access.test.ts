// The route × role table: for every route the app serves, which roles get 2xx and which 401/403.
// A route added without a line here fails the first test, so the table stays complete.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roles, type Role } from '#shared/schemas/enums.ts';
import type { RouteSpec } from '#server/routes/registry.ts';
import { pageById } from '#src/config/navigation.ts';
import { createTestApp, rolePasswords, type TestApp } from '../../setup/app.ts';
import { accessFixtures, type Fixture } from './access-fixtures.ts';

let t: TestApp;
let fixtures: Record<string, Fixture>;
beforeAll(async () => {
  t = await createTestApp();
  fixtures = await accessFixtures(t);
});
afterAll(() => t.close());

const key = (r: Pick<RouteSpec, 'method' | 'path'>) => `${r.method.toUpperCase()} ${r.path}`;

function send(fixture: Fixture, cookie?: string) {
  const agent = request(t.app);
  const req = agent[fixture.method](fixture.url);
  if (cookie) req.set('Cookie', cookie);
  if (fixture.attach) {
    for (const [field, value] of Object.entries(fixture.fields ?? {})) req.field(field, value);
    req.attach('file', Buffer.from(fixture.attach.content), fixture.attach.name);
    return req;
  }
  return fixture.body === undefined ? req : req.send(fixture.body as object);
}

describe('route × role table', () => {
  it('has a fixture for every route the app serves, and no fixture for a route that does not exist', () => {
    const served = t.app.locals.routes.map(key).sort();
    expect(Object.keys(fixtures).sort()).toEqual(served);
  });

  it('lists at least the routes of the foundation', () => {
    const served = t.app.locals.routes.map(key);
    for (const k of ['GET /api/health', 'POST /api/auth/login', 'GET /api/auth/me', 'GET /api/users', 'GET /api/openapi.json']) {
      expect(served).toContain(k);
    }
  });

  it('imports (upload, history, rejects) admit admin and engineer only, as the Imports page does', () => {
    const importRoutes = t.app.locals.routes.filter((r) => r.path.startsWith('/api/imports'));
    expect(importRoutes.map(key).sort()).toEqual(['GET /api/imports', 'GET /api/imports/:id', 'GET /api/imports/:id/rejects.csv', 'POST /api/imports']);
    for (const route of importRoutes) expect(route.access, key(route)).toEqual(['admin', 'engineer']);
    expect(pageById('imports').roles).toEqual(['admin', 'engineer']);
  });

  const who: (Role | 'anonymous')[] = ['anonymous', ...roles];
  it.each(who)('%s gets 2xx exactly on the routes that admit it, else 401/403', async (role) => {
    const mismatches: string[] = [];
    for (const route of t.app.locals.routes) {
      const fixture = fixtures[key(route)];
      const admitted = route.access === 'public' || (role !== 'anonymous' && route.access.includes(role));
      const res = await send(fixture.build ? fixture.build() : fixture, role === 'anonymous' ? undefined : t.cookies[role]);
      const expected = admitted ? '2xx' : role === 'anonymous' ? '401' : '403';
      const got = res.status >= 200 && res.status < 300 ? '2xx' : String(res.status);
      if (got !== expected) mismatches.push(`${key(route)}: expected ${expected}, got ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
      if (fixture.endsSession && role !== 'anonymous') {
        const again = await request(t.app).post('/api/auth/login').send({ email: `${role}@test.example`, password: rolePasswords[role] });
        t.cookies[role] = String(again.headers['set-cookie']?.[0] ?? '').split(';')[0];
      }
    }
    expect(mismatches).toEqual([]);
  });
});
