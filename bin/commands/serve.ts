import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import type { Command } from 'commander';
import { closeDb, createDb } from '#server/db/client.ts';
import { clusterStatus, projectClusterDir, stopCluster } from '#server/db/cluster.ts';
import { migrateDb } from '#server/db/migrate.ts';
import { demoUsers, seedDemoUsers } from '#server/demo/users.ts';
import { startFakeSmtp, type FakeSmtp } from '#server/mail/fake-smtp.ts';
import { databaseUrlFromEnv, nightlyEnv, projectRoot, resolveDatabase, serverEnv } from '../config.ts';
import { stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { seedDemoPlantIfEmpty } from './seed.ts';

function buildClient() {
  stdio.err('Building the client (vite build)…');
  const r = spawnSync(join(projectRoot, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], {
    cwd: projectRoot,
    stdio: 'inherit',
  });
  if (r.status !== 0) throw new CliError('vite build failed');
}

export function registerServe(program: Command) {
  program
    .command('serve')
    .description('serve the API and the dashboard from one process on 127.0.0.1')
    .option('--port <port>', 'port (default $PORT or 3000)')
    .option('--host <host>', 'interface (default $HOST or 127.0.0.1)')
    .option('--first-run', 'build the client and, on an empty database, add the demo users and the demo plant (npm start)')
    .action(
      action(async (opts: { port?: string; host?: string; firstRun?: boolean }) => {
        const wasRunning = databaseUrlFromEnv() ? true : await clusterStatus(projectClusterDir(projectRoot)).then((s) => s.running);
        const target = await resolveDatabase((l) => stdio.err(l));
        const baseEnv = serverEnv(target.url, { ...(opts.port ? { PORT: opts.port } : {}), ...(opts.host ? { HOST: opts.host } : {}) });
        const db = createDb(target.url, { max: 2 });
        let seededUsers = 0;
        try {
          await migrateDb(db);
          if (opts.firstRun) {
            buildClient();
            seededUsers = await seedDemoUsers(db, baseEnv.BCRYPT_COST);
            await seedDemoPlantIfEmpty(db, (l) => stdio.err(l));
          }
        } finally {
          await closeDb(db);
        }
        // Without SMTP_URL outside production, a development mail server on loopback takes the mail, and the
        // server is told its address (the Mail page shows it). With SMTP_URL none is started.
        const mailEnv = nightlyEnv();
        let fakeSmtp: FakeSmtp | null = null;
        let fakeDb: ReturnType<typeof createDb> | null = null;
        if (!mailEnv.SMTP_URL && mailEnv.NODE_ENV !== 'production') {
          fakeDb = createDb(target.url, { max: 2 });
          fakeSmtp = await startFakeSmtp(fakeDb, { port: mailEnv.SMTP_FAKE_PORT, log: (l) => stdio.err(l) }).catch(async (err: Error) => {
            await closeDb(fakeDb!);
            throw new CliError(`the development mail server could not start on port ${mailEnv.SMTP_FAKE_PORT}: ${err.message}`);
          });
        }
        const env = fakeSmtp ? { ...baseEnv, SMTP_URL: fakeSmtp.url } : baseEnv;
        const stopMail = async () => {
          await fakeSmtp?.close();
          if (fakeDb) await closeDb(fakeDb);
        };
        // Loaded here so other commands do not load the whole web app at start.
        const { startServer } = await import('#server/index.ts');
        const server = await startServer(env).catch(async (err: unknown) => {
          await stopMail();
          throw err;
        });
        stdio.out(`\nOsmia is running at ${server.url}  (database: ${target.source === 'env' ? 'DATABASE_URL' : 'private cluster'})`);
        if (fakeSmtp) stdio.out(`Development mail server at ${fakeSmtp.url}: mail sent to it appears on the Mail page (admins); nothing is delivered.`);
        if (opts.firstRun || seededUsers > 0) {
          stdio.out('Demo sign-ins (e-mail / password):');
          for (const u of demoUsers) stdio.out(`  ${u.role.padEnd(9)} ${u.email.padEnd(26)} ${u.password}`);
        }
        stdio.out('Press Ctrl-C to stop (the data is kept).');
        await new Promise<void>((resolve) => {
          const stop = () => resolve();
          process.once('SIGINT', stop);
          process.once('SIGTERM', stop);
        });
        stdio.err('\nStopping…');
        await server.close();
        await stopMail();
        if (target.source === 'private' && !wasRunning && target.clusterDir) await stopCluster(target.clusterDir);
      }),
    );
}
