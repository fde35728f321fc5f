import { existsSync } from 'node:fs';
import type { Command } from 'commander';
import { Cron } from 'croner';
import { z } from 'zod';
import { codeQuerySchema, isoDateSchema, timeZoneSchema } from '#shared/schemas/common.ts';
import type { NightlyEnv } from '#server/env.ts';
import type { Db } from '#server/db/client.ts';
import { readColumnMap, type ColumnMap } from '#server/importers/column-map.ts';
import { nightlyZone, runNightly, type NightlyOptions } from '#server/jobs/nightly.ts';
import { startFakeSmtp } from '#server/mail/fake-smtp.ts';
import { instantText } from '#server/mail/format.ts';
import { createMailer, type Mailer } from '#server/mail/transport.ts';
import { inboxDir, nightlyEnv, reportsDir } from '../config.ts';
import { formatNightlyRun, nightlyExitCode } from '../formatters/nightly.ts';
import { formatJson, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

const flagsSchema = z.object({
  inbox: z.string().min(1).optional(),
  site: codeQuerySchema.optional(),
  tz: timeZoneSchema.optional(),
  map: z.string().min(1).optional(),
  today: isoDateSchema.optional(),
  json: z.boolean().optional(),
});
type Flags = z.infer<typeof flagsSchema>;

function parseFlags(raw: unknown): Flags {
  const parsed = flagsSchema.safeParse(raw);
  if (!parsed.success) throw new CliError(parsed.error.issues.map((i) => `--${i.path.join('.')}: ${i.message}`).join('\n'), 2);
  return parsed.data;
}

function columnMap(file: string | undefined): ColumnMap | undefined {
  if (!file) return undefined;
  if (!existsSync(file)) throw new CliError(`column map file not found: ${file}`, 2);
  try {
    return readColumnMap(file);
  } catch (err) {
    throw new CliError((err as Error).message, 2);
  }
}

/**
 * The mailer of a command: SMTP_URL when set; else, outside production, the development mail server (its
 * messages land on the Mail page) — on SMTP_FAKE_PORT, or, when another Osmia process already listens
 * there, through that one; in production without SMTP_URL none, and mail waits in the outbox.
 */
async function withMailer<T>(db: Db, env: NightlyEnv, log: (l: string) => void, fn: (mailer: Mailer | null, noMailerReason?: string) => Promise<T>): Promise<T> {
  if (env.SMTP_URL) {
    const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
    try {
      return await fn(mailer);
    } finally {
      mailer.close();
    }
  }
  if (env.NODE_ENV === 'production') return fn(null, 'SMTP_URL is not set: mail waits in the outbox until an SMTP server is configured');
  let fake: Awaited<ReturnType<typeof startFakeSmtp>> | null = null;
  try {
    fake = await startFakeSmtp(db, { port: env.SMTP_FAKE_PORT, log });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE') throw err;
  }
  const url = fake?.url ?? `smtp://127.0.0.1:${env.SMTP_FAKE_PORT}`;
  log(`mail goes to the development mail server at ${url} (admins read it on the Mail page); set SMTP_URL for a real relay`);
  const mailer = createMailer(url, env.MAIL_FROM);
  try {
    return await fn(mailer);
  } finally {
    mailer.close();
    await fake?.close();
  }
}

function nightlyOptions(flags: Flags, env: NightlyEnv, trigger: NightlyOptions['trigger'], log: (l: string) => void): Omit<NightlyOptions, 'mailer'> {
  return {
    inbox: inboxDir(flags.inbox, env),
    trigger,
    site: flags.site,
    tz: flags.tz,
    columnMap: columnMap(flags.map),
    reportDate: flags.today,
    timeZone: env.NIGHTLY_TZ,
    reportsDir: reportsDir(),
    publicUrl: env.PUBLIC_URL,
    log,
  };
}

const commonOptions = (c: Command) =>
  c
    .option('--inbox <dir>', 'the folder to import from (default $INBOX_DIR or .osmia/inbox)')
    .option('--site <code>', 'site of every import (optional while one site exists; an asset register with it creates the site)')
    .option('--tz <zone>', 'IANA time zone of naive timestamps, and of a site an asset register creates')
    .option('--map <file>', 'column map for every file: JSON {"Their header":"our_header"} or lines Their header=our_header');

export function registerNightly(program: Command) {
  commonOptions(
    program
      .command('nightly')
      .description('import every file waiting in the inbox (in dependency order), refresh once, then mail the digest and alerts: for cron'),
  )
    .option('--today <date>', 'report as if today were this day (YYYY-MM-DD): the digest covers the day before it and the 7 days before it')
    .option('--json', 'print the run record as JSON')
    .action(
      action(async (raw: unknown) => {
        const flags = parseFlags(raw);
        const env = nightlyEnv();
        // Progress on stderr, the record on stdout: `>> nightly.log 2>&1` keeps both, --json stays parseable.
        const log = (l: string) => stdio.err(l);
        return withDb(async (db) =>
          withMailer(db, env, log, async (mailer, noMailerReason) => {
            const run = await runNightly(db, { ...nightlyOptions(flags, env, 'cli', log), mailer, noMailerReason });
            stdio.out(flags.json ? formatJson(run) : formatNightlyRun(run));
            return nightlyExitCode(run);
          }),
        );
      }),
    );

  commonOptions(
    program
      .command('schedule')
      .description('run the nightly job in this process on NIGHTLY_CRON (default "15 2 * * *", in NIGHTLY_TZ or the first site’s zone) until SIGINT or SIGTERM'),
  ).action(
    action(async (raw: unknown) => {
      const flags = parseFlags(raw);
      const env = nightlyEnv();
      const log = (l: string) => stdio.out(`${new Date().toISOString()} ${l}`);
      await withDb(async (db) =>
        withMailer(db, env, log, async (mailer, noMailerReason) => {
          const zone = await nightlyZone(db, env.NIGHTLY_TZ);
          let current: Promise<void> | null = null;
          const job: Cron = new Cron(env.NIGHTLY_CRON, { timezone: zone, protect: () => log('the previous run is still going: this time is skipped') }, (): Promise<void> => {
            current = runNightly(db, { ...nightlyOptions(flags, env, 'schedule', log), mailer, noMailerReason }).then(
              (run) => log(`nightly run ${run.id}: ${run.outcome}${run.error ? ` (${run.error})` : ''}; next at ${instantText(job.nextRun() ?? new Date(), zone)}`),
              (err: Error) => log(`nightly run failed: ${err.message}`),
            );
            return current.finally(() => (current = null));
          });
          log(`schedule: nightly at "${env.NIGHTLY_CRON}" (${zone}); next at ${instantText(job.nextRun() ?? new Date(), zone)}. Ctrl-C or SIGTERM stops it.`);
          const signal = await new Promise<NodeJS.Signals>((resolve) => {
            process.once('SIGINT', () => resolve('SIGINT'));
            process.once('SIGTERM', () => resolve('SIGTERM'));
          });
          job.stop();
          if (current) {
            // A second signal ends the process at once (the default action): the run is safe to kill (docs/design.md §7).
            log(`${signal}: waiting for the run in progress to finish (send it again to stop now)`);
            await current;
          }
          log('schedule stopped');
        }),
      );
    }),
  );
}
