// The KPIs Osmia answers, in one list: name, who may read it, its query and answer schemas, and the
// service that computes it. GET /api/kpi/<name> and `osmia kpi <name>` are both built from it.
import type { ZodType } from 'zod';
import type { Settings } from '#shared/schemas/settings.ts';
import { roles, type Role } from '#shared/schemas/enums.ts';
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
import type { Db } from '../db/client.ts';
import { freshnessOf } from './freshness.ts';
import { getSettings } from './settings.ts';

export type KpiService = (db: Db, query: never) => Promise<unknown>;

export interface KpiEntry {
  name: string;
  summary: string;
  access: readonly Role[];
  query: ZodType;
  response: ZodType;
  /** Whether it reads the tables derived from samples (hourly rollups, stop events), so its freshness depends on refresh. */
  readsDerived: boolean;
  /** Loaded on first use, so a CLI command that does not need it starts faster. */
  load: () => Promise<KpiService>;
}

const operations = ['admin', 'engineer', 'manager'] as const;

export const kpiCatalog: KpiEntry[] = [
  {
    name: 'reliability',
    summary: 'MTBF with confidence bounds, MTTR, availability',
    access: operations,
    query: reliabilityQuerySchema,
    response: reliabilityReportSchema,
    readsDerived: true,
    load: async () => (await import('./reliability.ts')).getReliability,
  },
  {
    name: 'element-life',
    summary: 'Element survival (Kaplan–Meier) and Weibull life by group',
    access: roles,
    query: elementLifeQuerySchema,
    response: elementLifeReportSchema,
    readsDerived: false,
    load: async () => (await import('./element-life.ts')).getElementLife,
  },
  {
    name: 'forecast',
    summary: 'Expected element replacements and cost for the next 12 months',
    access: roles,
    query: forecastQuerySchema,
    response: forecastReportSchema,
    readsDerived: false,
    load: async () => (await import('./forecast.ts')).getForecast,
  },
  {
    name: 'time-to-complete',
    summary: 'Job durations by procedure, crew and guided vs unguided',
    access: operations,
    query: timeToCompleteQuerySchema,
    response: timeToCompleteReportSchema,
    readsDerived: false,
    load: async () => (await import('./time-to-complete.ts')).getTimeToComplete,
  },
  {
    name: 'downtime',
    summary: 'Stops, planned vs unplanned, causes, lost volume and cost',
    access: roles,
    query: downtimeQuerySchema,
    response: downtimeReportSchema,
    readsDerived: true,
    load: async () => (await import('./downtime.ts')).getDowntime,
  },
  {
    name: 'performance',
    summary: 'Normalized membrane performance per train and stage (ASTM D4516)',
    access: operations,
    query: performanceQuerySchema,
    response: performanceReportSchema,
    readsDerived: true,
    load: async () => (await import('./performance.ts')).getPerformance,
  },
  {
    name: 'maintenance-mix',
    summary: 'Planned vs reactive hours, PM compliance, backlog, cost per m³',
    access: roles,
    query: maintenanceMixQuerySchema,
    response: maintenanceMixReportSchema,
    readsDerived: true,
    load: async () => (await import('./maintenance-mix.ts')).getMaintenanceMix,
  },
];

/** The plant's confidence setting stands in for a query that names none (the schemas' own default is 0.9). */
export async function withPlantDefaults(db: Db, raw: Record<string, unknown>): Promise<Record<string, unknown>> {
  if (hasConfidence(raw)) return raw;
  return plantDefaults(raw, await getSettings(db));
}

/** `withPlantDefaults` with the settings already read. */
export function plantDefaults(raw: Record<string, unknown>, settings: Pick<Settings, 'confidence'>): Record<string, unknown> {
  return hasConfidence(raw) ? raw : { ...raw, confidence: settings.confidence };
}

function hasConfidence(raw: Record<string, unknown>): boolean {
  return raw.confidence !== undefined && raw.confidence !== '';
}

/**
 * The answer of one KPI with its freshness (dataAsOf, derivedUpToDate, warnings): what the API, the
 * CLI and the warmer all serve. `query` is already parsed by the entry's query schema.
 */
export async function answerKpi(db: Db, kpi: KpiEntry, query: object): Promise<object> {
  const run = await kpi.load();
  const report = (await run(db, query as never)) as { site?: string; to?: string | null; asOf?: string };
  const freshness = await freshnessOf(db, report.site, report.to ?? report.asOf, kpi.readsDerived);
  return { ...report, ...freshness };
}
