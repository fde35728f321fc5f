import { messageFor } from '#shared/errors.ts';
import { healthSchema, type Health } from '#shared/schemas/health.ts';
import type { AppDeps } from '../deps.ts';
import type { RouteRegistry } from './registry.ts';

const startedAt = Date.now();

export function healthRoutes(r: RouteRegistry, { db }: AppDeps) {
  r.get('/api/health', { access: 'public', summary: 'Server and database status', response: healthSchema }, async (_req, res) => {
    const t0 = performance.now();
    let database: Health['database'];
    try {
      await db.$client.query('select 1');
      database = { up: true, latencyMs: Math.round((performance.now() - t0) * 10) / 10 };
    } catch {
      // Anyone may ask (no session): the driver's message names host and port, so it stays out.
      database = { up: false, latencyMs: null, error: messageFor('database-unavailable') };
    }
    const body: Health = {
      status: database.up ? 'ok' : 'degraded',
      version: process.env.npm_package_version ?? '0.1.0',
      uptimeSeconds: Math.round((Date.now() - startedAt) / 1000),
      database,
    };
    res.status(database.up ? 200 : 503).json(body);
  });
}
