// bin/osmia run the way a person runs it, through the real launcher, against a test database.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const osmia = fileURLToPath(new URL('../../bin/osmia', import.meta.url));

/** Run `bin/osmia args…` on the database at `url`, with `input` piped to standard input (not a terminal). */
export function runCli(url: string, args: readonly string[], input = ''): { code: number | null; out: string; err: string } {
  const r = spawnSync(osmia, args, { env: { ...process.env, DATABASE_URL: url, CI: '1' }, encoding: 'utf8', timeout: 120_000, input });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
