import type { Command } from 'commander';
import { clusterStatus, projectClusterDir, stopCluster } from '#server/db/cluster.ts';
import { closeDb, createDb } from '#server/db/client.ts';
import { migrateDb } from '#server/db/migrate.ts';
import { resetDb } from '#server/db/reset.ts';
import { databaseUrlFromEnv, projectRoot, resolveDatabase } from '../config.ts';
import { formatJson, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';

/** Connect, run `fn`, close: the one way commands touch the database. */
export async function withDb<T>(
  fn: (db: ReturnType<typeof createDb>, url: string) => Promise<T>,
  log?: (l: string) => void,
  options: { migrate?: boolean } = {},
): Promise<T> {
  const target = await resolveDatabase(log);
  const db = createDb(target.url);
  try {
    if (options.migrate !== false) await migrateDb(db);
    return await fn(db, target.url);
  } finally {
    await closeDb(db);
  }
}

export function registerDb(program: Command) {
  const db = program.command('db').description('the database: start, stop, status, reset');

  db.command('up')
    .description('start the private PostgreSQL cluster (or check DATABASE_URL) and apply migrations')
    .action(
      action(async () => {
        await withDb(async (_db, url) => stdio.out(`database up: ${url}`), (l) => stdio.err(l));
      }),
    );

  db.command('down')
    .description('stop the private cluster, keeping its data')
    .action(
      action(async () => {
        if (databaseUrlFromEnv()) throw new CliError('DATABASE_URL is set: that server is not Osmia’s to stop');
        const stopped = await stopCluster(projectClusterDir(projectRoot));
        stdio.out(stopped ? 'database stopped' : 'database was not running');
      }),
    );

  db.command('status')
    .description('is the database running, and at which URL')
    .option('--json', 'print {"running":…,"url":…}')
    .action(
      action(async (opts: { json?: boolean }) => {
        const fromEnv = databaseUrlFromEnv();
        let status: { running: boolean; url: string | null };
        if (fromEnv) {
          const probe = createDb(fromEnv, { max: 1 });
          const running = await probe.$client.query('select 1').then(
            () => true,
            () => false,
          );
          await closeDb(probe);
          status = { running, url: fromEnv };
        } else {
          const s = await clusterStatus(projectClusterDir(projectRoot));
          status = { running: s.running, url: s.url };
        }
        stdio.out(opts.json ? formatJson(status) : status.running ? `running: ${status.url}` : 'not running');
        return status.running ? 0 : 1;
      }),
    );

  db.command('reset')
    .description('empty every table and re-apply the migrations (no demo data)')
    .option('--yes', 'confirm: this deletes all data')
    .action(
      action(async (opts: { yes?: boolean }) => {
        if (!opts.yes) throw new CliError('db reset deletes all data: add --yes to confirm', 2);
        await withDb(
          async (d) => {
            await resetDb(d);
            stdio.out('database reset: all tables empty, migrations applied');
          },
          undefined,
          { migrate: false },
        );
      }),
    );
}
