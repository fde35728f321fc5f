// A private PostgreSQL cluster from Debian's packages, run on 127.0.0.1 for `npm start`, `npm test`
// and `osmia db up`. initdb refuses to run as root, so as root every server command runs as the
// `postgres` system user, and the cluster folder must be reachable by that user.
import { execFile, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync, chownSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
const isRoot = process.getuid?.() === 0;
/** Unix-domain socket paths are limited to about 107 bytes; keep the folder well below. */
const maxDirLength = 90;
export const databaseName = 'osmia';

export class ClusterError extends Error {}

function findPgBin(): string | undefined {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return undefined;
  const versions = readdirSync(base)
    .filter((v) => existsSync(join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(a) - Number(b));
  const newest = versions.at(-1);
  return newest ? join(base, newest, 'bin') : undefined;
}

/** The server binaries, installing Debian's `postgresql` package when absent and running as root. */
export function ensurePostgres(log: (line: string) => void = () => {}): string {
  const found = findPgBin();
  if (found) return found;
  if (!isRoot) {
    throw new ClusterError(
      'PostgreSQL server binaries not found. Install them with `sudo apt-get install -y postgresql` ' +
        '(Debian/Ubuntu), or set DATABASE_URL to a server you already have.',
    );
  }
  log('PostgreSQL is not installed: installing Debian package "postgresql" (apt-get)…');
  // Debian would create and start a default cluster; Osmia runs its own, so turn that off first.
  mkdirSync('/etc/postgresql-common', { recursive: true });
  writeFileSync('/etc/postgresql-common/createcluster.conf', 'create_main_cluster = false\n');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', '--no-install-recommends', 'postgresql']]) {
    const r = spawnSync('apt-get', args, { stdio: ['ignore', 'ignore', 'pipe'], env });
    if (r.status !== 0) throw new ClusterError(`apt-get ${args.join(' ')} failed: ${r.stderr?.toString().slice(-500)}`);
  }
  const bin = findPgBin();
  if (!bin) throw new ClusterError('apt-get installed postgresql but no server binaries were found');
  return bin;
}

/** Run a PostgreSQL binary, as the postgres user when we are root. */
async function pg(bin: string, tool: string, args: string[]) {
  const cmd = join(bin, tool);
  return isRoot ? run('runuser', ['-u', 'postgres', '--', cmd, ...args]) : run(cmd, args);
}

function canPostgresWrite(dir: string): boolean {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-w', dir]).status === 0;
}

function prepareDir(dir: string): boolean {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  if (isRoot) {
    const pw = spawnSync('id', ['-u', 'postgres']);
    if (pw.status !== 0) throw new ClusterError('the "postgres" system user is missing; reinstall the postgresql package');
    const uid = Number(pw.stdout.toString());
    const gid = Number(spawnSync('id', ['-g', 'postgres']).stdout.toString());
    chownSync(dir, uid, gid);
  }
  return canPostgresWrite(dir);
}

/**
 * Where the project's cluster lives: `.osmia/pg` in the checkout when the cluster's user can reach
 * it and the path is short enough for a socket; otherwise a folder of its own under /var/tmp, keyed
 * to the checkout so two checkouts never share one.
 */
export function projectClusterDir(projectRoot: string): string {
  const inside = resolve(projectRoot, '.osmia', 'pg');
  const pointer = resolve(projectRoot, '.osmia', 'cluster-dir');
  if (existsSync(pointer)) return readFileSync(pointer, 'utf8').trim();
  if (inside.length <= maxDirLength && prepareDir(inside)) return inside;
  const key = createHash('sha256').update(resolve(projectRoot)).digest('hex').slice(0, 12);
  const outside = `/var/tmp/osmia-${key}`;
  if (!prepareDir(outside)) throw new ClusterError(`cannot prepare a cluster folder that user postgres can write: ${outside}`);
  mkdirSync(resolve(projectRoot, '.osmia'), { recursive: true });
  writeFileSync(pointer, outside + '\n');
  return outside;
}

export function freePort(preferred?: number): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.once('error', (err: NodeJS.ErrnoException) => {
      if (preferred !== undefined && err.code === 'EADDRINUSE') freePort().then(resolvePort, reject);
      else reject(err);
    });
    server.listen(preferred ?? 0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolvePort(port));
    });
  });
}

const urlFor = (port: number, db = databaseName) => `postgres://postgres@127.0.0.1:${port}/${db}`;

async function isRunning(bin: string, dir: string): Promise<boolean> {
  if (!existsSync(join(dir, 'data', 'PG_VERSION'))) return false;
  try {
    await pg(bin, 'pg_ctl', ['-D', join(dir, 'data'), 'status']);
    return true;
  } catch {
    return false;
  }
}

export interface ClusterStatus {
  running: boolean;
  url: string | null;
  dir: string;
}

export async function clusterStatus(dir: string): Promise<ClusterStatus> {
  const bin = findPgBin();
  const portFile = join(dir, 'port');
  const port = existsSync(portFile) ? Number(readFileSync(portFile, 'utf8')) : undefined;
  const running = bin ? await isRunning(bin, dir) : false;
  return { running, url: running && port ? urlFor(port) : null, dir };
}

/**
 * Start (creating on first use) the cluster in `dir` and make sure database `osmia` exists.
 * Reuses the saved port when the cluster is already running. Returns the connection URL.
 */
export async function startCluster(dir: string, log: (line: string) => void = () => {}): Promise<string> {
  const bin = ensurePostgres(log);
  if (dir.length > maxDirLength) throw new ClusterError(`cluster folder path too long for a socket (${dir.length} > ${maxDirLength}): ${dir}`);
  if (!prepareDir(dir)) throw new ClusterError(`user postgres cannot write ${dir}; set DATABASE_URL or move the checkout`);
  const data = join(dir, 'data');
  const portFile = join(dir, 'port');
  if (await isRunning(bin, dir)) return urlFor(Number(readFileSync(portFile, 'utf8')));

  if (!existsSync(join(data, 'PG_VERSION'))) {
    log(`Creating a private PostgreSQL cluster in ${dir} …`);
    await pg(bin, 'initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8', '--no-sync']);
  }
  const saved = existsSync(portFile) ? Number(readFileSync(portFile, 'utf8')) : undefined;
  const port = await freePort(saved);
  writeFileSync(portFile, String(port));
  const options = `-h 127.0.0.1 -p ${port} -k ${dir} -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200`;
  try {
    await pg(bin, 'pg_ctl', ['-D', data, '-l', join(dir, 'postgres.log'), '-w', '-t', '60', 'start', '-o', options]);
  } catch (err) {
    const tail = existsSync(join(dir, 'postgres.log')) ? readFileSync(join(dir, 'postgres.log'), 'utf8').slice(-800) : '';
    throw new ClusterError(`PostgreSQL did not start: ${(err as Error).message}\n${tail}`);
  }
  try {
    await pg(bin, 'createdb', ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', databaseName]);
  } catch (err) {
    if (!String((err as { stderr?: string }).stderr).includes('already exists')) throw err;
  }
  return urlFor(port);
}

/** Stop the cluster, keeping its data. */
export async function stopCluster(dir: string): Promise<boolean> {
  const bin = findPgBin();
  if (!bin || !(await isRunning(bin, dir))) return false;
  await pg(bin, 'pg_ctl', ['-D', join(dir, 'data'), '-m', 'fast', '-w', 'stop']);
  return true;
}

/** A cluster that exists for one test run, removed by the returned function. */
export async function startThrowawayCluster(log?: (line: string) => void): Promise<{ url: string; dispose: () => Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir().length < 40 ? tmpdir() : '/tmp', 'osmia-test-'));
  const url = await startCluster(dir, log);
  return {
    url,
    dispose: async () => {
      await stopCluster(dir).catch(() => false);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
