import type { Command } from 'commander';
import { HttpError } from '#server/errors.ts';
import { catchUpDerived } from '#server/services/freshness.ts';
import { ZodError } from 'zod';
import type { Freshness } from '#shared/schemas/common.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '#server/db/client.ts';
import {
  downtimeKpi,
  elementLifeKpi,
  forecastKpi,
  maintenanceMixKpi,
  performanceKpi,
  reliabilityKpi,
  timeToCompleteKpi,
  type Kpi,
} from '#server/services/kpi-catalog.ts';
import { getSettings } from '#server/services/settings.ts';
import { formatDowntime } from '../formatters/downtime.ts';
import { formatElementLife } from '../formatters/element-life.ts';
import { formatForecast } from '../formatters/forecast.ts';
import { formatMaintenanceMix } from '../formatters/maintenance-mix.ts';
import { formatPerformance } from '../formatters/performance.ts';
import { formatReliability } from '../formatters/reliability.ts';
import { formatTimeToComplete } from '../formatters/time-to-complete.ts';
import { formatJson, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

/** A KPI with the pure formatter that prints its answer as a table (bin/formatters/<kpi>.ts). */
interface KpiCommand {
  kpi: Kpi;
  run: (db: Db, raw: Record<string, unknown>, settings: Settings) => Promise<{ answer: Freshness; table: () => string }>;
}

/** Pairs a KPI with its formatter, with the answer's type checked between them. */
function command<Answer extends Freshness>(kpi: Kpi<Answer>, format: (answer: Answer) => string): KpiCommand {
  return {
    kpi,
    run: async (db, raw, settings) => {
      const answer = await kpi.ask(raw, settings).answer(db);
      return { answer, table: () => format(answer) };
    },
  };
}

const commands: KpiCommand[] = [
  command(reliabilityKpi, formatReliability),
  command(elementLifeKpi, formatElementLife),
  command(forecastKpi, formatForecast),
  command(timeToCompleteKpi, formatTimeToComplete),
  command(downtimeKpi, formatDowntime),
  command(performanceKpi, formatPerformance),
  command(maintenanceMixKpi, formatMaintenanceMix),
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
  for (const { kpi: k, run } of commands) {
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
          await withDb(async (db) => {
            let answered;
            try {
              if (k.readsDerived) await catchUpDerived(db);
              answered = await run(db, input, await getSettings(db));
            } catch (err) {
              if (err instanceof ZodError) throw usage(err.issues);
              throw err instanceof HttpError ? new CliError(err.message) : err;
            }
            for (const warning of answered.answer.warnings) stdio.err(`Warning: ${warning}`);
            stdio.out(flags.json ? formatJson(answered.answer) : answered.table());
          });
        }),
      );
  }
}
