import { join } from 'node:path';
import type { Command } from 'commander';
import { ZodError } from 'zod';
import { HttpError } from '#server/errors.ts';
import { prepareReport, writePreparedReport } from '#server/reports/index.ts';
import { reportNames, reportRequestSchema, type ReportResult } from '#shared/schemas/reports.ts';
import { reportsDir } from '../config.ts';
import { formatJson, formatNumber, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

interface ReportFlags {
  site?: string;
  from?: string;
  to?: string;
  out?: string;
  json?: boolean;
}

const usage = (issues: readonly { path: PropertyKey[]; message: string }[]) =>
  new CliError(issues.map((i) => (i.path[0] === 'name' ? `<name>: ${i.message}` : `--${String(i.path[0] ?? '')}: ${i.message}`)).join('; '), 2);

/** `osmia report <name>`: the workbook the API serves at /api/reports/<name>.xlsx, written to a file. */
export function registerReport(program: Command) {
  program
    .command('report')
    .description(`write a spreadsheet workbook (${reportNames.join(', ')}) for a site and window`)
    .argument('<name>', reportNames.join(' | '))
    .option('--site <code>', 'site code (optional when only one site exists)')
    .option('--from <date>', 'first day, YYYY-MM-DD, midnight in the site’s zone (default: the first day of its data)')
    .option('--to <date>', 'day after the last, YYYY-MM-DD, not included (default: the day after its data ends)')
    .option('--out <file>', 'file to write (default: reports/<today>/<name>-<site>-<from>-<to>.xlsx, listed with the stored workbooks)')
    .option('--json', 'print {"path", "sheets": [{"name", "rows"}]}')
    .action(
      action(async (name: string, flags: ReportFlags) => {
        const checked = reportRequestSchema.safeParse({ name, site: flags.site, from: flags.from, to: flags.to });
        if (!checked.success) throw usage(checked.error.issues);
        await withDb(async (db) => {
          let prepared;
          try {
            prepared = await prepareReport(db, checked.data);
          } catch (err) {
            if (err instanceof ZodError) throw usage(err.issues);
            if (err instanceof HttpError) throw new CliError(err.message, err.code === 'invalid-window' ? 2 : 1);
            throw err;
          }
          const result: ReportResult = await writePreparedReport(prepared, flags.out ?? join(reportsDir(), prepared.builtDay, prepared.fileName));
          if (flags.json) stdio.out(formatJson(result));
          else {
            const rows = result.sheets.map((s) => `  ${s.name}: ${formatNumber(s.rows)} ${s.rows === 1 ? 'row' : 'rows'}`);
            stdio.out([`Wrote ${result.path}`, ...rows].join('\n'));
          }
        });
      }),
    );
}
