import type { Command } from 'commander';
import { refresh } from '#server/jobs/refresh.ts';
import { formatJson, stdio } from '../output.ts';
import { action } from '../run.ts';
import { withDb } from './db.ts';

export function registerRefresh(program: Command) {
  program
    .command('refresh')
    .description('rebuild what is derived from samples (hourly rollups, stop events) for the hours imports touched')
    .option('--full', 'rebuild everything, not just what changed')
    .option('--json', 'print the result as JSON')
    .action(
      action(async (flags: { full?: boolean; json?: boolean }) => {
        await withDb(async (db) => {
          const result = await refresh(db, { full: flags.full, log: flags.json ? undefined : (l) => stdio.err(l) });
          if (flags.json) stdio.out(formatJson(result));
        });
      }),
    );
}
