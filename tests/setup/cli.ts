// bin/osmia run the way a person runs it, through the real launcher, against a test database.
import { spawn, spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const osmia = fileURLToPath(new URL('../../bin/osmia', import.meta.url));

/** Run `bin/osmia args…` on the database at `url`, with `input` piped to standard input (not a terminal). */
export function runCli(url: string, args: readonly string[], input = ''): { code: number | null; out: string; err: string } {
  const r = spawnSync(osmia, args, { env: { ...process.env, DATABASE_URL: url, CI: '1' }, encoding: 'utf8', timeout: 120_000, input });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/**
 * `bin/osmia args…` started without waiting for it, for what runSync cannot do: a server in this test's
 * own process that the command talks to (runSync would block it), a second run alongside, a kill -9.
 * The command leads its own process group, so `process.kill(-child.pid, 'SIGKILL')` ends all of it.
 */
export function spawnCli(url: string, args: readonly string[], env: Record<string, string> = {}) {
  const child = spawn(osmia, args, { env: { ...process.env, DATABASE_URL: url, CI: '1', ...env }, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (err += d));
  const done = new Promise<{ code: number | null; signal: NodeJS.Signals | null; out: string; err: string }>((resolve) =>
    child.on('close', (code, signal) => resolve({ code, signal, out, err })),
  );
  return { child, done, output: () => ({ out, err }) };
}
