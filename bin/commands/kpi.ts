import type { Command } from 'commander';
import type { z } from 'zod';
import { elementLifeQuerySchema, forecastQuerySchema, reliabilityQuerySchema, timeToCompleteQuerySchema } from '#shared/schemas/kpi.ts';
import { downtimeQuerySchema, maintenanceMixQuerySchema, performanceQuerySchema } from '#shared/schemas/kpi-ops.ts';
import type { Db } from '#server/db/client.ts';
import { HttpError } from '#server/errors.ts';
import { formatJson, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

interface Loaded {
  run: (db: Db, query: never) => Promise<unknown>;
  format: (report: never) => string;
}

interface KpiCommand {
  name: string;
  description: string;
  schema: z.ZodType;
  /** The service and formatter are loaded when the command runs, so `osmia --help` starts fast. */
  load: () => Promise<Loaded>;
}

// One entry per KPI: the same service as GET /api/kpi/<name>, then a pure formatter.
const kpis: KpiCommand[] = [
  {
    name: 'reliability',
    description: 'MTBF with confidence bounds, MTTR, availability',
    schema: reliabilityQuerySchema,
    load: async () => ({ run: (await import('#server/services/reliability.ts')).getReliability, format: (await import('../formatters/reliability.ts')).formatReliability }),
  },
  {
    name: 'element-life',
    description: 'element survival and Weibull life by group',
    schema: elementLifeQuerySchema,
    load: async () => ({ run: (await import('#server/services/element-life.ts')).getElementLife, format: (await import('../formatters/element-life.ts')).formatElementLife }),
  },
  {
    name: 'forecast',
    description: 'expected element replacements and cost, next 12 months',
    schema: forecastQuerySchema,
    load: async () => ({ run: (await import('#server/services/forecast.ts')).getForecast, format: (await import('../formatters/forecast.ts')).formatForecast }),
  },
  {
    name: 'time-to-complete',
    description: 'job durations by procedure, crew, guided vs unguided',
    schema: timeToCompleteQuerySchema,
    load: async () => ({
      run: (await import('#server/services/time-to-complete.ts')).getTimeToComplete,
      format: (await import('../formatters/time-to-complete.ts')).formatTimeToComplete,
    }),
  },
  {
    name: 'downtime',
    description: 'stops, planned vs unplanned, causes, lost volume and cost',
    schema: downtimeQuerySchema,
    load: async () => ({ run: (await import('#server/services/downtime.ts')).getDowntime, format: (await import('../formatters/downtime.ts')).formatDowntime }),
  },
  {
    name: 'performance',
    description: 'normalized membrane performance per train and stage',
    schema: performanceQuerySchema,
    load: async () => ({ run: (await import('#server/services/performance.ts')).getPerformance, format: (await import('../formatters/performance.ts')).formatPerformance }),
  },
  {
    name: 'maintenance-mix',
    description: 'planned vs reactive hours, PM compliance, backlog, cost per m³',
    schema: maintenanceMixQuerySchema,
    load: async () => ({
      run: (await import('#server/services/maintenance-mix.ts')).getMaintenanceMix,
      format: (await import('../formatters/maintenance-mix.ts')).formatMaintenanceMix,
    }),
  },
];

interface KpiFlags {
  site?: string;
  asset?: string;
  from?: string;
  to?: string;
  groupBy?: string;
  confidence?: string;
  json?: boolean;
}

export function registerKpi(program: Command) {
  const kpi = program.command('kpi').description('compute a KPI and print it as a table, or as JSON with --json');
  for (const k of kpis) {
    kpi
      .command(k.name)
      .description(k.description)
      .option('--site <code>', 'site code (optional when only one site exists)')
      .option('--asset <code>', 'asset code: that asset and everything below it')
      .option('--from <date>', 'window start, ISO date or date-time (a bare date is midnight in the site’s zone)')
      .option('--to <date>', 'window end (exclusive)')
      .option('--group-by <group>', 'grouping, where the KPI has one (element-life: all|train|stage|position|model)')
      .option('--confidence <c>', 'confidence level of intervals, 0–1', '0.9')
      .option('--json', 'print the JSON object the API serves')
      .action(
        action(async (flags: KpiFlags) => {
          const input = Object.fromEntries(Object.entries({ ...flags, json: undefined }).filter(([, v]) => v !== undefined));
          const parsed = k.schema.safeParse(input);
          if (!parsed.success) throw new CliError(parsed.error.issues.map((i) => `--${String(i.path[0] ?? '')}: ${i.message}`).join('; '), 2);
          const { run, format } = await k.load();
          await withDb(async (db) => {
            const report = await run(db, parsed.data as never).catch((err: unknown) => {
              throw err instanceof HttpError ? new CliError(err.message) : err;
            });
            stdio.out(flags.json ? formatJson(report) : format(report as never));
          });
        }),
      );
  }
}
