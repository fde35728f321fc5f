import type { Request, Response } from 'express';
import { dataVersionAndSettings } from '../db/queries/data-version.ts';
import type { AppDeps } from '../deps.ts';
import { kpiCatalog } from '../services/kpi-catalog.ts';
import { catchUpDerived } from '../services/freshness.ts';
import { KpiCache, type CacheAnswer } from '../services/kpi-cache.ts';
import { KpiWarmer } from '../services/kpi-warmer.ts';
import { settingsOf } from '../services/settings.ts';
import type { RouteRegistry } from './registry.ts';

/**
 * Send a cached answer as is: gzip when the client takes it (the compression middleware then stands
 * aside). Server-Timing says whether it was computed for this request (and how long that took) or
 * served from the cache.
 */
function sendCached(req: Request, res: Response, { body, hit }: CacheAnswer) {
  res.type('application/json');
  res.vary('Accept-Encoding');
  res.setHeader(
    'Server-Timing',
    hit ? 'cache;desc="hit"' : `compute;dur=${body.computeMs.toFixed(1)}, encode;dur=${body.encodeMs.toFixed(1)}`,
  );
  if (req.acceptsEncodings('gzip') === 'gzip') {
    res.setHeader('Content-Encoding', 'gzip');
    res.send(body.gzip);
  } else res.send(body.json);
}

/** GET /api/kpi/<name>: the same objects `osmia kpi <name> --json` prints (roles in server/services/kpi-catalog.ts). */
export function kpiRoutes(r: RouteRegistry, { db, env, onClose }: AppDeps) {
  const cache = new KpiCache();
  if (env.KPI_WARM_SECONDS > 0) {
    const warmer = new KpiWarmer(db, cache).start(env.KPI_WARM_SECONDS * 1000);
    onClose?.(() => warmer.stop());
  }
  for (const kpi of kpiCatalog) {
    r.get(`/api/kpi/${kpi.name}`, { access: kpi.access, summary: kpi.summary, query: kpi.query, response: kpi.response }, async (req, res) => {
      // The data version, the plant's settings (read once, passed down) and what waits for refresh: one round trip.
      let read = await dataVersionAndSettings(db.$client);
      const question = kpi.ask({ ...req.query }, settingsOf(read.stored));
      // A little imported data not yet rolled up is rolled up now, so this answer already counts it.
      if (kpi.readsDerived && (await catchUpDerived(db, read.lagTagHours))) read = await dataVersionAndSettings(db.$client);
      sendCached(req, res, await cache.get(read.version, kpi.name, question.query, () => question.answer(db)));
    });
  }
}
