import type { TestApp } from '../../setup/app.ts';

/** One valid request per route, used by the route × role table. */
export interface Fixture {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  url: string;
  body?: unknown;
  fields?: Record<string, string>;
  attach?: { name: string; content: string };
  /** For requests that must differ on each call (e.g. a new user's e-mail). */
  build?: () => Fixture;
}

let counter = 0;

export async function accessFixtures(t: TestApp): Promise<Record<string, Fixture>> {
  const users = await t.db.query.users.findMany();
  const manager = users.find((u) => u.role === 'manager')!;
  return {
    'GET /api/health': { method: 'get', url: '/api/health' },
    'GET /api/openapi.json': { method: 'get', url: '/api/openapi.json' },
    'POST /api/auth/login': { method: 'post', url: '/api/auth/login', body: { email: 'admin@test.example', password: 'admin-password-1' } },
    'POST /api/auth/logout': { method: 'post', url: '/api/auth/logout' },
    'GET /api/auth/me': { method: 'get', url: '/api/auth/me' },
    'GET /api/users': { method: 'get', url: '/api/users' },
    'POST /api/users': {
      method: 'post',
      url: '/api/users',
      build: () => ({
        method: 'post',
        url: '/api/users',
        body: { email: `new-${++counter}@test.example`, role: 'finance', password: 'a-long-password' },
      }),
    },
    'PATCH /api/users/:id': { method: 'patch', url: `/api/users/${manager.id}`, body: { name: 'Manager' } },
    'GET /api/settings': { method: 'get', url: '/api/settings' },
    'PUT /api/settings': { method: 'put', url: '/api/settings', body: { currency: 'EUR' } },
  };
}
