// An import killed mid-file (kill -9) or cut off from the database leaves nothing of the file behind,
// and running it again completes it.
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../setup/db.ts';
import { counts, fileWith, seedPlant } from '../server/importers/helpers.ts';

const osmia = join(import.meta.dirname, '..', '..', 'bin', 'osmia');
let t: TestDatabase;
let bigFile: string;
const rows = 600_000;

beforeAll(async () => {
  t = await createTestDatabase();
  await seedPlant(t.db);
  const lines = ['timestamp,tag,value,quality'];
  const start = Date.UTC(2025, 0, 1);
  for (let i = 0; i < rows / 3; i++) {
    const ts = new Date(start + i * 60_000).toISOString();
    lines.push(`${ts},TR1.PP,${(i % 100) / 10},good`, `${ts},TR1.PF,${150 + (i % 7)},good`, `${ts},TR1.RUN,1,good`);
  }
  bigFile = fileWith(lines.join('\n') + '\n', 'big.csv');
});
afterAll(() => t.close());

function runCli(args: string[]) {
  const child = spawn(osmia, args, { env: { ...process.env, DATABASE_URL: t.url }, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (out += d));
  const done = new Promise<{ code: number | null; signal: string | null; out: string }>((resolve) =>
    child.on('exit', (code, signal) => resolve({ code, signal, out })),
  );
  return { child, done };
}

/** Wait until PostgreSQL reports a COPY into samples under way with some rows in it. */
async function waitForCopy(): Promise<number> {
  for (let i = 0; i < 600; i++) {
    const { rows: r } = await t.db.$client.query(
      `select p.pid, p.tuples_processed from pg_stat_progress_copy p join pg_class c on c.oid = p.relid where c.relname = 'samples'`,
    );
    if (r[0] && Number(r[0].tuples_processed) > 1000) return r[0].pid;
    await new Promise((res) => setTimeout(res, 20));
  }
  throw new Error('the import never started copying');
}

describe('interrupted imports', () => {
  it('kill -9 mid-file leaves no sample behind; the record says interrupted; a re-run completes', async () => {
    const before = await counts(t.db);
    const { child, done } = runCli(['import', 'historian', bigFile, '--json']);
    await waitForCopy();
    process.kill(-child.pid!, 'SIGKILL');
    const ended = await done;
    expect(ended.signal).toBe('SIGKILL');
    // The server notices the dead client and rolls its transaction back.
    for (let i = 0; i < 100 && (await t.db.$client.query(`select 1 from pg_stat_progress_copy`)).rowCount; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await counts(t.db)).toEqual(before);

    const again = runCli(['import', 'historian', bigFile, '--json']);
    const result = await again.done;
    expect(result.code).toBe(0);
    const record = JSON.parse(result.out.slice(result.out.indexOf('{')));
    expect(record).toMatchObject({ status: 'completed', rowsInserted: rows, rowsRejected: 0 });
    expect((await counts(t.db)).samples).toBe(before.samples + rows);
    const { rows: history } = await t.db.$client.query(`select status, error from imports where kind = 'historian' order by id`);
    expect(history.map((h) => h.status)).toEqual(['failed', 'completed']);
    expect(history[0].error).toMatch(/interrupted/);
  });

  it('a lost database connection mid-file fails the import (exit 1) and keeps nothing', async () => {
    const before = await counts(t.db);
    const shifted = fileWith((await import('node:fs')).readFileSync(bigFile, 'utf8').replaceAll('2025-', '2024-'), 'shifted.csv');
    const { done } = runCli(['import', 'historian', shifted, '--json']);
    const pid = await waitForCopy();
    await t.db.$client.query('select pg_terminate_backend($1)', [pid]);
    const ended = await done;
    expect(ended.code).toBe(1);
    expect(ended.out).toMatch(/Error: /);
    expect(await counts(t.db)).toEqual(before);
    const rerun = await runCli(['import', 'historian', shifted, '--json']).done;
    expect(rerun.code).toBe(0);
    expect((await counts(t.db)).samples).toBe(before.samples + rows);
  });

  it('two imports of the same file at once: one lands, the other is a duplicate, no sample twice', async () => {
    const content = Array.from({ length: 2000 }, (_, i) => `${new Date(Date.UTC(2023, 0, 1) + i * 60_000).toISOString()},TR1.PP,${i}`);
    const file = fileWith(['timestamp,tag,value', ...content].join('\n'), 'twice.csv');
    const before = await counts(t.db);
    const [a, b] = await Promise.all([runCli(['import', 'historian', file, '--json']).done, runCli(['import', 'historian', file, '--json']).done]);
    const statuses = [a, b].map((r) => JSON.parse(r.out.slice(r.out.indexOf('{'))).status).sort();
    expect(statuses).toEqual(['completed', 'duplicate']);
    expect((await counts(t.db)).samples).toBe(before.samples + 2000);
  });
});
