import { roles } from '#shared/schemas/enums.ts';
import {
  elementLifeQuerySchema,
  elementLifeReportSchema,
  forecastQuerySchema,
  forecastReportSchema,
  reliabilityQuerySchema,
  reliabilityReportSchema,
  timeToCompleteQuerySchema,
  timeToCompleteReportSchema,
} from '#shared/schemas/kpi.ts';
import {
  downtimeQuerySchema,
  downtimeReportSchema,
  maintenanceMixQuerySchema,
  maintenanceMixReportSchema,
  performanceQuerySchema,
  performanceReportSchema,
} from '#shared/schemas/kpi-ops.ts';
import type { Request, Response } from 'express';
import type { AppDeps } from '../deps.ts';
import { getDowntime } from '../services/downtime.ts';
import { getElementLife } from '../services/element-life.ts';
import { getForecast } from '../services/forecast.ts';
import { getMaintenanceMix } from '../services/maintenance-mix.ts';
import { getPerformance } from '../services/performance.ts';
import { getReliability } from '../services/reliability.ts';
import { getTimeToComplete } from '../services/time-to-complete.ts';
import { KpiCache, type CachedBody } from '../services/kpi-cache.ts';
import type { RouteRegistry } from './registry.ts';

const operations = ['admin', 'engineer', 'manager'] as const;

/** Send a cached answer as is: gzip when the client takes it (the compression middleware then stands aside). */
function sendCached(req: Request, res: Response, body: CachedBody) {
  res.type('application/json');
  res.vary('Accept-Encoding');
  if (req.acceptsEncodings('gzip') === 'gzip') {
    res.setHeader('Content-Encoding', 'gzip');
    res.send(body.gzip);
  } else res.send(body.json);
}

/** GET /api/kpi/<name>: the same objects `osmia kpi <name> --json` prints. */
export function kpiRoutes(r: RouteRegistry, { db }: AppDeps) {
  const cache = new KpiCache();
  r.get('/api/kpi/reliability', { access: operations, summary: 'MTBF with confidence bounds, MTTR, availability', query: reliabilityQuerySchema, response: reliabilityReportSchema }, async (req, res) => {
    const query = reliabilityQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getReliability', query, () => getReliability(db, query)));
  });
  r.get('/api/kpi/element-life', { access: roles, summary: 'Element survival (Kaplan–Meier) and Weibull life by group', query: elementLifeQuerySchema, response: elementLifeReportSchema }, async (req, res) => {
    const query = elementLifeQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getElementLife', query, () => getElementLife(db, query)));
  });
  r.get('/api/kpi/forecast', { access: roles, summary: 'Expected element replacements and cost for the next 12 months', query: forecastQuerySchema, response: forecastReportSchema }, async (req, res) => {
    const query = forecastQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getForecast', query, () => getForecast(db, query)));
  });
  r.get('/api/kpi/time-to-complete', { access: operations, summary: 'Job durations by procedure, crew and guided vs unguided', query: timeToCompleteQuerySchema, response: timeToCompleteReportSchema }, async (req, res) => {
    const query = timeToCompleteQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getTimeToComplete', query, () => getTimeToComplete(db, query)));
  });
  r.get('/api/kpi/downtime', { access: roles, summary: 'Stops, planned vs unplanned, causes, lost volume and cost', query: downtimeQuerySchema, response: downtimeReportSchema }, async (req, res) => {
    const query = downtimeQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getDowntime', query, () => getDowntime(db, query)));
  });
  r.get('/api/kpi/performance', { access: operations, summary: 'Normalized membrane performance per train and stage (ASTM D4516)', query: performanceQuerySchema, response: performanceReportSchema }, async (req, res) => {
    const query = performanceQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getPerformance', query, () => getPerformance(db, query)));
  });
  r.get('/api/kpi/maintenance-mix', { access: roles, summary: 'Planned vs reactive hours, PM compliance, backlog, cost per m³', query: maintenanceMixQuerySchema, response: maintenanceMixReportSchema }, async (req, res) => {
    const query = maintenanceMixQuerySchema.parse(req.query);
    sendCached(req, res, await cache.get(db, 'getMaintenanceMix', query, () => getMaintenanceMix(db, query)));
  });
}
