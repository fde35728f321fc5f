import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import type { Role } from '#shared/schemas/enums.ts';
import { createApp } from '#server/app.ts';
import { secretKey } from '#server/auth/session.ts';
import { loadEnv, type Env } from '#server/env.ts';
import { createUser } from '#server/services/users.ts';
import { createTestDatabase, type TestDatabase } from './db.ts';

export const testSecret = 'test-secret-that-is-long-enough-for-hs256-000';
export const rolePasswords: Record<Role, string> = {
  admin: 'admin-password-1',
  engineer: 'engineer-password-1',
  manager: 'manager-password-1',
  finance: 'finance-password-1',
};

export interface TestApp extends TestDatabase {
  app: ReturnType<typeof createApp>;
  env: Env;
  /** Session cookie of the seeded user of each role. */
  cookies: Record<Role, string>;
}

/** `clientDist`: a built client (vite build) for the app to serve beside the API, as in production. */
export async function createTestApp(envOverrides: Record<string, string> = {}, options: { clientDist?: string } = {}): Promise<TestApp> {
  const database = await createTestDatabase();
  // Stored workbooks of this app only (GET /api/reports lists them), never the checkout's reports/.
  const reportsDir = mkdtempSync(join(tmpdir(), 'osmia-reports-'));
  const env = loadEnv({
    NODE_ENV: 'test',
    DATABASE_URL: database.url,
    JWT_SECRET: testSecret,
    BCRYPT_COST: '4',
    LOGIN_RATE_LIMIT: '1000',
    // No background recomputation unless a test asks for it (tests/server/services/kpi-cache.test.ts).
    KPI_WARM_SECONDS: '0',
    REPORTS_DIR: reportsDir,
    ...envOverrides,
  });
  const app = createApp({ db: database.db, env, sessionKey: secretKey(env.JWT_SECRET) }, { log: () => {}, clientDist: options.clientDist });
  const cookies = {} as Record<Role, string>;
  for (const role of Object.keys(rolePasswords) as Role[]) {
    await createUser(database.db, { email: `${role}@test.example`, name: role, role, password: rolePasswords[role] }, 4);
    const res = await request(app).post('/api/auth/login').send({ email: `${role}@test.example`, password: rolePasswords[role] });
    if (res.status !== 200) throw new Error(`login of ${role} failed: ${res.status} ${JSON.stringify(res.body)}`);
    cookies[role] = String(res.headers['set-cookie']?.[0] ?? '').split(';')[0];
  }
  const close = async () => {
    await database.close();
    rmSync(reportsDir, { recursive: true, force: true });
  };
  return { ...database, close, app, env, cookies };
}
