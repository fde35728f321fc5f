// Resolves the CLI's configuration once: flag > environment > default. With bin/… scripts and
// server/env.ts, the only code that reads process.env.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { projectClusterDir, startCluster } from '#server/db/cluster.ts';
import { projectRoot } from '#server/paths.ts';
import { loadEnv, loadNightlyEnv, type Env, type NightlyEnv } from '#server/env.ts';

export { projectRoot };
/** Git-ignored: the private cluster (or a pointer to it), the generated secret, demo files. */
export const dataDir = join(projectRoot, '.osmia');

export interface DbTarget {
  url: string;
  /** 'env' when DATABASE_URL named the server, 'private' for the project's own cluster. */
  source: 'env' | 'private';
  clusterDir?: string;
}

export function databaseUrlFromEnv(): string | undefined {
  const url = process.env.DATABASE_URL?.trim();
  return url ? url : undefined;
}

/** DATABASE_URL when set, else the project's private cluster, started when it is not running. */
export async function resolveDatabase(log: (line: string) => void = () => {}): Promise<DbTarget> {
  const fromEnv = databaseUrlFromEnv();
  if (fromEnv) return { url: fromEnv, source: 'env' };
  const clusterDir = projectClusterDir(projectRoot);
  const url = await startCluster(clusterDir, log);
  return { url, source: 'private', clusterDir };
}

/**
 * The session-signing secret: JWT_SECRET when set; otherwise, outside production, one generated on
 * first use and kept in the git-ignored data folder (mode 600), so sessions survive a restart.
 */
export function resolveSecret(): string {
  const fromEnv = process.env.JWT_SECRET?.trim();
  if (fromEnv) return fromEnv;
  if (process.env.NODE_ENV === 'production') {
    throw new Error('JWT_SECRET must be set in production (at least 32 characters); see .env.example');
  }
  const file = join(dataDir, 'secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dirname(file), { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}

export function serverEnv(databaseUrl: string, overrides: Partial<Record<string, string>> = {}): Env {
  return loadEnv({
    CLIENT_DIST: join(projectRoot, 'dist'),
    ...process.env,
    ...overrides,
    DATABASE_URL: databaseUrl,
    JWT_SECRET: resolveSecret(),
  });
}

/** Where `osmia report` writes without --out: REPORTS_DIR, else reports/ at the project root. */
export function reportsDir(): string {
  const fromEnv = process.env.REPORTS_DIR?.trim();
  return fromEnv ? fromEnv : join(projectRoot, 'reports');
}

export function isTerminal(): boolean {
  return Boolean(process.stdout.isTTY) && !process.env.CI;
}

/** The nightly run's settings (INBOX_DIR, SMTP_URL, MAIL_FROM, PUBLIC_URL, NIGHTLY_CRON, NIGHTLY_TZ), checked once. */
export function nightlyEnv(): NightlyEnv {
  return loadNightlyEnv(process.env);
}

/**
 * The inbox folder: --inbox (relative to the working folder, as any path on a command line), else
 * INBOX_DIR (relative to the project root, so a crontab line reads the same folder from anywhere), else
 * .osmia/inbox.
 */
export function inboxDir(flag: string | undefined, env: Pick<NightlyEnv, 'INBOX_DIR'>): string {
  return flag ? resolve(flag) : resolve(projectRoot, env.INBOX_DIR ?? join(dataDir, 'inbox'));
}
