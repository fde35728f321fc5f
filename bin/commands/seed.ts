import { join } from 'node:path';
import type { Command } from 'commander';
import type { Db } from '#server/db/client.ts';
import { seedDemo, seedDemoIfEmpty } from '#server/demo/seed.ts';
import { seedDemoUsers } from '#server/demo/users.ts';
import { dataDir, serverEnv } from '../config.ts';
import { formatImportSummary } from './import.ts';
import { stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

const demoDir = join(dataDir, 'demo');

/** npm start: the full demo (3 years at 5-minute steps) on an empty database. */
export async function seedDemoPlantIfEmpty(db: Db, log: (l: string) => void): Promise<void> {
  await seedDemoIfEmpty(db, { outDir: demoDir, log });
}

export function registerSeed(program: Command) {
  program
    .command('seed')
    .description('load the invented demo plant through the importers (and the demo users when there are none)')
    .option('--demo', 'the demo plant (required: it is the only seed there is)')
    .option('--years <n>', 'years of historian data', '3')
    .option('--step-minutes <m>', 'historian resolution in minutes', '5')
    .option('--seed <text>', 'random seed of the generator', 'tamsel-flats')
    .option('--out <dir>', 'where the generated files go', demoDir)
    .action(
      action(async (flags: { demo?: boolean; years: string; stepMinutes: string; seed: string; out: string }) => {
        if (!flags.demo) throw new CliError('say what to seed: --demo', 2);
        await withDb(async (db, url) => {
          await seedDemoUsers(db, serverEnv(url).BCRYPT_COST);
          const result = await seedDemo(db, {
            outDir: flags.out,
            years: Number(flags.years),
            stepMinutes: Number(flags.stepMinutes),
            seed: flags.seed,
            log: (l) => stdio.err(l),
          }).catch((err: Error) => {
            throw new CliError(err.message);
          });
          stdio.out(formatImportSummary(result.records));
        });
      }),
    );
}
