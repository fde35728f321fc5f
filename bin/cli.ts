import { Command, CommanderError } from 'commander';
import { registerDb } from './commands/db.ts';
import { registerServe } from './commands/serve.ts';
import { registerUser } from './commands/user.ts';
import { registerSeed } from './commands/seed.ts';
import { registerImport } from './commands/import.ts';
import { registerKpi } from './commands/kpi.ts';
import { registerRefresh } from './commands/refresh.ts';
import { registerReport } from './commands/report.ts';
import { registerNightly } from './commands/nightly.ts';
import { CliError, exitState } from './run.ts';

/** Exit codes: 0 ok, 1 error, 2 usage, 3 some rows rejected. */
export function buildProgram(): Command {
  const program = new Command('osmia')
    .description('Osmia: maintenance KPIs for membrane water-treatment plants')
    .version('0.1.0')
    .showHelpAfterError('(add --help for usage)')
    .exitOverride();
  registerDb(program);
  registerUser(program);
  registerServe(program);
  registerSeed(program);
  registerImport(program);
  registerRefresh(program);
  registerKpi(program);
  registerReport(program);
  registerNightly(program);
  for (const command of program.commands) command.exitOverride();
  const recurse = (c: Command) => c.commands.forEach((s) => (s.exitOverride(), recurse(s)));
  recurse(program);
  return program;
}

export async function main(argv: string[]): Promise<number> {
  exitState.code = 0;
  try {
    await buildProgram().parseAsync(argv, { from: 'user' });
    return exitState.code;
  } catch (err) {
    if (err instanceof CommanderError) {
      // --help and --version end here with code 0; anything else commander refused is usage.
      return err.exitCode === 0 ? 0 : 2;
    }
    process.stderr.write(`Error: ${err instanceof Error ? err.message : String(err)}\n`);
    return err instanceof CliError ? err.exitCode : 1;
  }
}

export function run(): void {
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
