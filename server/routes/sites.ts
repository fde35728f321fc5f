import { roles } from '#shared/schemas/enums.ts';
import { siteListSchema } from '#shared/schemas/sites.ts';
import { listSites } from '../db/queries/sites.ts';
import type { AppDeps } from '../deps.ts';
import type { RouteRegistry } from './registry.ts';

export function siteRoutes(r: RouteRegistry, { db }: AppDeps) {
  r.get('/api/sites', { access: roles, summary: 'Sites (created by an asset-register import)', response: siteListSchema }, async (_req, res) => {
    const sites = await listSites(db.$client);
    res.json({ sites: sites.map(({ code, name, timeZone }) => ({ code, name, timeZone })) });
  });
}
