import type { Command } from 'commander';
import { HttpError } from '#server/errors.ts';
import { catchUpDerived } from '#server/services/freshness.ts';
import { answerKpi, kpiCatalog, withPlantDefaults } from '#server/services/kpi-catalog.ts';
import { formatJson, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

type Formatter = (report: never) => string;

/** The pure formatter of each KPI (bin/formatters/<kpi>.ts), loaded when the command runs. */
const formatters: Record<string, () => Promise<Formatter>> = {
  reliability: async () => (await import('../formatters/reliability.ts')).formatReliability,
  'element-life': async () => (await import('../formatters/element-life.ts')).formatElementLife,
  forecast: async () => (await import('../formatters/forecast.ts')).formatForecast,
  'time-to-complete': async () => (await import('../formatters/time-to-complete.ts')).formatTimeToComplete,
  downtime: async () => (await import('../formatters/downtime.ts')).formatDowntime,
  performance: async () => (await import('../formatters/performance.ts')).formatPerformance,
  'maintenance-mix': async () => (await import('../formatters/maintenance-mix.ts')).formatMaintenanceMix,
};

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
  for (const k of kpiCatalog) {
    kpi
      .command(k.name)
      .description(k.summary)
      .option('--site <code>', 'site code (optional when only one site exists)')
      .option('--asset <code>', 'asset code: that asset and everything below it')
      .option('--from <date>', 'window start, ISO date or date-time (a bare date is midnight in the site’s zone)')
      .option('--to <date>', 'window end (exclusive)')
      .option('--group-by <group>', 'grouping, where the KPI has one (element-life, forecast: all|train|stage|position|model)')
      .option('--confidence <c>', 'confidence level of intervals, 0.5–0.999 (default: the plant setting, 0.9)')
      .option('--json', 'print the JSON object the API serves')
      .action(
        action(async (flags: KpiFlags) => {
          const input = Object.fromEntries(Object.entries({ ...flags, json: undefined }).filter(([, v]) => v !== undefined));
          const usage = (issues: { path: PropertyKey[]; message: string }[]) =>
            new CliError(issues.map((i) => `--${String(i.path[0] ?? '')}: ${i.message}`).join('; '), 2);
          const checked = k.query.safeParse(input);
          if (!checked.success) throw usage(checked.error.issues);
          const format = await formatters[k.name]();
          await withDb(async (db) => {
            const parsed = k.query.safeParse(await withPlantDefaults(db, input));
            if (!parsed.success) throw usage(parsed.error.issues);
            if (k.readsDerived) await catchUpDerived(db);
            const report = (await answerKpi(db, k, parsed.data as object).catch((err: unknown) => {
              throw err instanceof HttpError ? new CliError(err.message) : err;
            })) as { warnings: string[] };
            for (const warning of report.warnings) stdio.err(`Warning: ${warning}`);
            stdio.out(flags.json ? formatJson(report) : format(report as never));
          });
        }),
      );
  }
}
