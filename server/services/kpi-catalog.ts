// The KPIs Osmia answers, in one list: name, who may read it, its query and answer schemas, and the
// service that computes it. GET /api/kpi/<name> (routes/kpi.ts), `osmia kpi <name>` (bin/commands/kpi.ts)
// and the warmer (kpi-warmer.ts) are all built from it; each entry names its service directly.
import type { z, ZodType } from 'zod';
import type { BeforeFreshness, Freshness } from '#shared/schemas/common.ts';
import { roles, type Role } from '#shared/schemas/enums.ts';
import { elementLifeQuerySchema, elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastQuerySchema, forecastReportSchema } from '#shared/schemas/forecast.ts';
import { reliabilityQuerySchema, reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { timeToCompleteQuerySchema, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { downtimeQuerySchema, downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { maintenanceMixQuerySchema, maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { performanceQuerySchema, performanceReportSchema } from '#shared/schemas/performance.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { getDowntime } from './downtime.ts';
import { getElementLife } from './element-life.ts';
import { getForecast } from './forecast.ts';
import { freshnessOf } from './freshness.ts';
import { getMaintenanceMix } from './maintenance-mix.ts';
import { getPerformance } from './performance.ts';
import { getReliability } from './reliability.ts';
import { getTimeToComplete } from './time-to-complete.ts';

/** Every KPI answer: its site, and the freshness fields `answer` adds. */
type KpiAnswer = { site?: string } & Freshness;

/** One KPI, typed by its query and answer schemas. */
export interface KpiDefinition<Q extends ZodType<object>, A extends ZodType<KpiAnswer>> {
  name: string;
  summary: string;
  access: readonly Role[];
  query: Q;
  response: A;
  /** Whether it reads the tables derived from samples (hourly rollups, stop events), so its freshness depends on refresh. */
  readsDerived: boolean;
  /** The service: rows in, the answer without its freshness fields out. Settings are read once per request, by the caller. */
  compute: (db: Db, query: z.output<Q>, settings: Settings) => Promise<BeforeFreshness<z.output<A>>>;
  /** The instant the answer's figures run up to (its window's end), for `dataAsOf`. */
  asOf: (answer: BeforeFreshness<z.output<A>>) => string | null | undefined;
}

/** A question to one KPI, parsed: its cache key and how to answer it. */
export interface KpiQuestion<Answer = object> {
  /** The parsed query (the cache key). */
  query: object;
  answer: (db: Db) => Promise<Answer>;
}

/** A KPI as the route, the CLI and the warmer use it. */
export interface Kpi<Answer = object> {
  name: string;
  summary: string;
  access: readonly Role[];
  query: ZodType;
  response: ZodType;
  readsDerived: boolean;
  /**
   * Parse a raw query (query string, CLI flags, or a stored question) with the plant's settings: a query
   * that names no confidence takes the plant's confidence setting (the schemas' own default is 0.9). Throws
   * the ZodError of a bad query.
   */
  ask: (raw: Record<string, unknown>, settings: Settings) => KpiQuestion<Answer>;
}

/** The one place a query without a confidence takes the plant's. */
function withPlantConfidence(raw: Record<string, unknown>, settings: Pick<Settings, 'confidence'>): Record<string, unknown> {
  return raw.confidence !== undefined && raw.confidence !== '' ? raw : { ...raw, confidence: settings.confidence };
}

/** A KPI whose answers carry their freshness (dataAsOf, derivedUpToDate, warnings: freshness.ts). */
export function defineKpi<Q extends ZodType<object>, A extends ZodType<KpiAnswer>>(d: KpiDefinition<Q, A>): Kpi<z.output<A>> & { definition: KpiDefinition<Q, A> } {
  return {
    definition: d,
    name: d.name,
    summary: d.summary,
    access: d.access,
    query: d.query,
    response: d.response,
    readsDerived: d.readsDerived,
    ask(raw, settings) {
      const query = d.query.parse(withPlantConfidence(raw, settings));
      return {
        query,
        answer: async (db) => {
          const report = await d.compute(db, query, settings);
          const freshness = await freshnessOf(db, report.site, d.asOf(report), d.readsDerived);
          return { ...report, ...freshness } as z.output<A>;
        },
      };
    },
  };
}

const operations = ['admin', 'engineer', 'manager'] as const;
const windowEnd = (a: { to?: string | null }) => a.to;

export const reliabilityKpi = defineKpi({
  name: 'reliability',
  summary: 'MTBF with confidence bounds, MTTR, availability',
  access: operations,
  query: reliabilityQuerySchema,
  response: reliabilityReportSchema,
  readsDerived: true,
  compute: getReliability,
  asOf: windowEnd,
});

export const elementLifeKpi = defineKpi({
  name: 'element-life',
  summary: 'Element survival (Kaplan–Meier) and Weibull life by group',
  access: roles,
  query: elementLifeQuerySchema,
  response: elementLifeReportSchema,
  readsDerived: false,
  compute: getElementLife,
  asOf: windowEnd,
});

export const forecastKpi = defineKpi({
  name: 'forecast',
  summary: 'Expected element replacements and cost for the next 12 months',
  access: roles,
  query: forecastQuerySchema,
  response: forecastReportSchema,
  readsDerived: false,
  compute: getForecast,
  asOf: (a) => a.asOf,
});

export const timeToCompleteKpi = defineKpi({
  name: 'time-to-complete',
  summary: 'Job durations by procedure, crew and guided vs unguided',
  access: operations,
  query: timeToCompleteQuerySchema,
  response: timeToCompleteReportSchema,
  readsDerived: false,
  compute: getTimeToComplete,
  asOf: windowEnd,
});

export const downtimeKpi = defineKpi({
  name: 'downtime',
  summary: 'Stops, planned vs unplanned, causes, lost volume and cost',
  access: roles,
  query: downtimeQuerySchema,
  response: downtimeReportSchema,
  readsDerived: true,
  compute: getDowntime,
  asOf: windowEnd,
});

export const performanceKpi = defineKpi({
  name: 'performance',
  summary: 'Normalized membrane performance per train and stage (ASTM D4516)',
  access: operations,
  query: performanceQuerySchema,
  response: performanceReportSchema,
  readsDerived: true,
  compute: getPerformance,
  asOf: windowEnd,
});

export const maintenanceMixKpi = defineKpi({
  name: 'maintenance-mix',
  summary: 'Planned vs reactive hours, PM compliance, backlog, cost per m³',
  access: roles,
  query: maintenanceMixQuerySchema,
  response: maintenanceMixReportSchema,
  readsDerived: true,
  compute: getMaintenanceMix,
  asOf: windowEnd,
});

export const kpiCatalog: Kpi[] = [reliabilityKpi, elementLifeKpi, forecastKpi, timeToCompleteKpi, downtimeKpi, performanceKpi, maintenanceMixKpi];
