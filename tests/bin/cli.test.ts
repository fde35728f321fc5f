// One argv smoke test per command of bin/osmia, through the real launcher, against a test database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRecordSchema } from '#shared/schemas/imports.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { signIn } from '#server/services/users.ts';
import { createTestDatabase, type TestDatabase } from '../setup/db.ts';
import { fileWith, plant } from '../server/importers/helpers.ts';
import { runCli } from '../setup/cli.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
});
afterAll(() => t.close());

function cli(...args: string[]) {
  return cliWithInput('', ...args);
}

/** Run with `input` piped to standard input (not a terminal). */
function cliWithInput(input: string, ...args: string[]) {
  return runCli(t.url, args, input);
}

describe('bin/osmia', () => {
  it('prints help for every command and exits 0', () => {
    for (const args of [['--help'], ['db', '--help'], ['import', '--help'], ['kpi', 'reliability', '--help'], ['refresh', '--help'], ['seed', '--help'], ['user', 'add', '--help'], ['serve', '--help'], ['nightly', '--help'], ['schedule', '--help']]) {
      const r = cli(...args);
      expect(r.code, args.join(' ')).toBe(0);
      expect(r.out).toMatch(/Usage: osmia/);
    }
  });

  it('exits 2 on a usage error: unknown command, bad flag value, missing option', () => {
    expect(cli('frobnicate').code).toBe(2);
    expect(cli('kpi', 'reliability', '--confidence', '2').code).toBe(2);
    expect(cli('user', 'add', '--email', 'x@y.example').code).toBe(2);
    expect(cli('db', 'reset').code).toBe(2);
    expect(cli('nightly', '--today', '2025-02-30').code).toBe(2);
    expect(cli('nightly', '--tz', 'Nowhere/Land').code).toBe(2);
  });

  it('db status --json names the database it uses', () => {
    const r = cli('db', 'status', '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out)).toEqual({ running: true, url: t.url });
  });

  it('user add --password-stdin reads the password from standard input, and user list shows the user', async () => {
    const added = cliWithInput('a-long-password\n', 'user', 'add', '--email', 'cli@test.example', '--role', 'finance', '--password-stdin');
    expect(added.code, added.err).toBe(0);
    expect(added.err).toBe('');
    const list = cli('user', 'list', '--json');
    expect(JSON.parse(list.out).map((u: { email: string }) => u.email)).toContain('cli@test.example');
    // The line ending is not part of the password.
    expect((await signIn(t.db, 'cli@test.example', 'a-long-password')).user.role).toBe('finance');
    expect(cliWithInput('a-long-password\n', 'user', 'add', '--email', 'cli@test.example', '--role', 'finance', '--password-stdin').code).toBe(1);
  });

  it('user add refuses a short password from standard input, and asks for one when none is piped', () => {
    const short = cliWithInput('short\r\n', 'user', 'add', '--email', 'short@test.example', '--role', 'finance', '--password-stdin');
    expect(short.code).toBe(2);
    expect(short.err).toMatch(/--password: at least 10 characters/);
    const none = cli('user', 'add', '--email', 'none@test.example', '--role', 'finance');
    expect(none.code).toBe(2);
    expect(none.err).toMatch(/--password-stdin/);
    expect(cliWithInput('a-long-password\n', 'user', 'add', '--email', 'both@test.example', '--role', 'finance', '--password-stdin', '--password', 'a-long-password').code).toBe(2);
    expect(JSON.parse(cli('user', 'list', '--json').out).map((u: { email: string }) => u.email)).not.toContain('none@test.example');
  });

  it('user add --password still works, with a warning on stderr that other processes can read it', async () => {
    const r = cli('user', 'add', '--email', 'flag@test.example', '--role', 'manager', '--password', 'flag-password-1');
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^Warning: --password puts the password on the command line/);
    expect((await signIn(t.db, 'flag@test.example', 'flag-password-1')).user.role).toBe('manager');
  });

  it('import: 0 when every row went in, 3 when some were rejected, 1 when the file failed; --json is the import record', () => {
    const assets = cli('import', 'assets', fileWith(plant.assets), '--site', 'CLI', '--tz', 'Europe/Berlin', '--json');
    expect(assets.code).toBe(0);
    expect(importRecordSchema.parse(JSON.parse(assets.out))).toMatchObject({ status: 'completed', rowsInserted: 5 });
    const tags = cli('import', 'tags', fileWith(plant.tags + '\nBAD,NOPE,feed_flow,m3/h\n'), '--json');
    expect(tags.code).toBe(3);
    expect(JSON.parse(tags.out).rejects).toEqual([{ line: 8, reason: 'unknown asset "NOPE" on site CLI' }]);
    const empty = cli('import', 'tags', fileWith(''));
    expect(empty.code).toBe(1);
    expect(empty.out).toMatch(/empty/);
    expect(cli('import', 'tags', '/no/such/file.csv').code).toBe(1);
  });

  it('refresh, then kpi reliability --json prints the docs/design.md §7 object', () => {
    cli('import', 'historian', fileWith('timestamp,tag,value\n2026-01-01T00:00:00Z,TR1.RUN,1\n2026-01-01T10:00:00Z,TR1.RUN,0\n'));
    expect(cli('refresh').code).toBe(0);
    const r = cli('kpi', 'reliability', '--asset', 'TR1', '--json');
    expect(r.code).toBe(0);
    const report = reliabilityReportSchema.parse(JSON.parse(r.out));
    expect(report).toMatchObject({ asset: 'TR1', failures: 0, confidence: 0.9, operatingHours: 10 });
    const table = cli('kpi', 'reliability', '--asset', 'TR1');
    expect(table.code).toBe(0);
    expect(table.out).toMatch(/MTBF/);
  });
});
