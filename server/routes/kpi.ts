import type { Request, Response } from 'express';
import { dataVersion } from '../db/queries/data-version.ts';
import type { AppDeps } from '../deps.ts';
import { kpiCatalog, withPlantDefaults } from '../services/kpi-catalog.ts';
import { KpiCache, type CachedBody } from '../services/kpi-cache.ts';
import type { RouteRegistry } from './registry.ts';

/** Send a cached answer as is: gzip when the client takes it (the compression middleware then stands aside). */
function sendCached(req: Request, res: Response, body: CachedBody) {
  res.type('application/json');
  res.vary('Accept-Encoding');
  if (req.acceptsEncodings('gzip') === 'gzip') {
    res.setHeader('Content-Encoding', 'gzip');
    res.send(body.gzip);
  } else res.send(body.json);
}

/** GET /api/kpi/<name>: the same objects `osmia kpi <name> --json` prints (roles in server/services/kpi-catalog.ts). */
export function kpiRoutes(r: RouteRegistry, { db }: AppDeps) {
  const cache = new KpiCache();
  for (const kpi of kpiCatalog) {
    r.get(`/api/kpi/${kpi.name}`, { access: kpi.access, summary: kpi.summary, query: kpi.query, response: kpi.response }, async (req, res) => {
      // The plant's defaults and the data version in parallel: two round trips, one wait.
      const [raw, version, run] = await Promise.all([withPlantDefaults(db, { ...req.query }), dataVersion(db.$client), kpi.load()]);
      const query = kpi.query.parse(raw) as object;
      sendCached(req, res, await cache.get(version, kpi.name, query, () => run(db, query as never)));
    });
  }
}
