import type { Command } from 'commander';
import { roles, type Role } from '#shared/schemas/enums.ts';
import { userCreateBodySchema } from '#shared/schemas/users.ts';
import { listUsers } from '#server/db/queries/users.ts';
import { createUser } from '#server/services/users.ts';
import { serverEnv } from '../config.ts';
import { formatJson, formatTable, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { promptSecret, readSecretFromStdin } from '../secret-input.ts';
import { withDb } from './db.ts';

interface AddFlags {
  email: string;
  role: Role;
  password?: string;
  passwordStdin?: boolean;
  name: string;
  json?: boolean;
}

/** The new user's password: from standard input, asked on the terminal, or (warned) from the flag. */
async function passwordFor(flags: AddFlags): Promise<string> {
  if (flags.password !== undefined && flags.passwordStdin) throw new CliError('give either --password-stdin or --password, not both', 2);
  if (flags.passwordStdin) return readSecretFromStdin();
  if (flags.password !== undefined) {
    stdio.err('Warning: --password puts the password on the command line, where other processes and the shell history can read it; use --password-stdin or answer the prompt instead.');
    return flags.password;
  }
  if (!process.stdin.isTTY) throw new CliError('no password: pipe it with --password-stdin, or run on a terminal to be asked for it', 2);
  const first = await promptSecret('Password (at least 10 characters): ');
  const again = await promptSecret('Same password again: ');
  if (first !== again) throw new CliError('the two passwords differ; nothing was added', 2);
  return first;
}

export function registerUser(program: Command) {
  const user = program.command('user').description('users who can sign in');

  user
    .command('add')
    .description('add a user')
    .requiredOption('--email <email>', 'sign-in e-mail')
    .requiredOption('--role <role>', `one of ${roles.join(', ')}`)
    .option('--password-stdin', 'read the password (at least 10 characters) from the first line of standard input')
    .option('--password <password>', 'the password on the command line: visible to other processes, prefer --password-stdin or the prompt')
    .option('--name <name>', 'display name', '')
    .option('--json', 'print the new user as JSON')
    .addHelpText('after', '\nWithout --password-stdin or --password, the password is asked on the terminal (not echoed).')
    .action(
      action(async (opts: AddFlags) => {
        const password = await passwordFor(opts);
        const parsed = userCreateBodySchema.safeParse({ email: opts.email, role: opts.role, name: opts.name, password });
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
