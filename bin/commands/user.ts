import type { Command } from 'commander';
import { roles, type Role } from '#shared/schemas/enums.ts';
import { userCreateBodySchema } from '#shared/schemas/users.ts';
import { listUsers } from '#server/db/queries/users.ts';
import { createUser } from '#server/services/users.ts';
import { serverEnv } from '../config.ts';
import { formatJson, formatTable, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

export function registerUser(program: Command) {
  const user = program.command('user').description('users who can sign in');

  user
    .command('add')
    .description('add a user')
    .requiredOption('--email <email>', 'sign-in e-mail')
    .requiredOption('--role <role>', `one of ${roles.join(', ')}`)
    .requiredOption('--password <password>', 'at least 10 characters')
    .option('--name <name>', 'display name', '')
    .option('--json', 'print the new user as JSON')
    .action(
      action(async (opts: { email: string; role: Role; password: string; name: string; json?: boolean }) => {
        const parsed = userCreateBodySchema.safeParse(opts);
        if (!parsed.success) {
          throw new CliError(parsed.error.issues.map((i) => `--${i.path.join('.')}: ${i.message}`).join('; '), 2);
        }
        await withDb(async (db, url) => {
          const created = await createUser(db, parsed.data, serverEnv(url).BCRYPT_COST).catch((err: Error) => {
            throw new CliError(err.message);
          });
          stdio.out(opts.json ? formatJson(created) : `added ${created.email} (${created.role})`);
        });
      }),
    );

  user
    .command('list')
    .description('list users')
    .option('--json', 'print JSON')
    .action(
      action(async (opts: { json?: boolean }) => {
        await withDb(async (db) => {
          const all = await listUsers(db);
          stdio.out(
            opts.json
              ? formatJson(all)
              : formatTable(
                  ['email', 'name', 'role', 'status', 'last sign-in'],
                  all.map((u) => [u.email, u.name, u.role, u.disabled ? 'disabled' : 'active', u.lastLoginAt ?? 'never']),
                ),
          );
        });
      }),
    );
}
