// `npm test`: type check, lint, then every vitest suite against a real PostgreSQL (the global setup
// starts a throwaway cluster, or uses DATABASE_URL). Ends with vitest's own counts, so a run that
// executed no test is visible: "N passed, N failed".
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..');
const bin = (name: string) => join(root, 'node_modules', '.bin', name);
const vitestArgs = process.argv.slice(2);

function step(title: string, cmd: string, args: string[]): boolean {
  process.stderr.write(`\n── ${title}\n`);
  const t0 = Date.now();
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit' });
  process.stderr.write(`── ${title}: ${r.status === 0 ? 'ok' : 'FAILED'} (${((Date.now() - t0) / 1000).toFixed(1)} s)\n`);
  return r.status === 0;
}

/** Browser tests drive Debian's Chromium; install it when missing and we may (root), as for PostgreSQL. */
function ensureChromium(): void {
  if (existsSync('/usr/bin/chromium')) return;
  if (process.getuid?.() !== 0) {
    process.stderr.write('Chromium is missing: install Debian package "chromium" for the browser tests (sudo apt-get install -y chromium).\n');
    return;
  }
  process.stderr.write('Installing Debian package "chromium" for the browser tests (apt-get)…\n');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update'], { stdio: 'ignore', env });
  spawnSync('apt-get', ['install', '-y', '--no-install-recommends', 'chromium'], { stdio: ['ignore', 'ignore', 'inherit'], env });
}

/**
 * The workbook tests recalculate every formula with a real spreadsheet engine, LibreOffice headless from
 * Debian's libreoffice-calc-nogui (about 200 MB): installed the same way when missing; without it those
 * checks are skipped and say so.
 */
function ensureLibreOffice(): void {
  if (existsSync('/usr/bin/soffice')) return;
  if (process.getuid?.() !== 0) {
    process.stderr.write('LibreOffice is missing: the workbook recalculation checks will be skipped (sudo apt-get install -y --no-install-recommends libreoffice-calc-nogui).\n');
    return;
  }
  process.stderr.write('Installing Debian package "libreoffice-calc-nogui" for the workbook tests (apt-get)…\n');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update'], { stdio: 'ignore', env });
  spawnSync('apt-get', ['install', '-y', '--no-install-recommends', 'libreoffice-calc-nogui'], { stdio: ['ignore', 'ignore', 'inherit'], env });
}

const failures: string[] = [];
ensureChromium();
ensureLibreOffice();
if (vitestArgs.length === 0) {
  if (!step('type check (app)', bin('tsc'), ['--noEmit', '-p', 'tsconfig.json'])) failures.push('typecheck');
  if (!step('type check (shared: no DOM, no Node)', bin('tsc'), ['--noEmit', '-p', 'shared/tsconfig.json'])) failures.push('typecheck shared');
  if (!step('lint', bin('eslint'), ['.'])) failures.push('lint');
}
const report = join(root, '.vitest.json');
rmSync(report, { force: true });
const testsOk = step('tests (vitest)', bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...vitestArgs]);
if (!testsOk) failures.push('tests');

if (existsSync(report)) {
  const counts = JSON.parse(readFileSync(report, 'utf8')) as { numPassedTests: number; numFailedTests: number; numTotalTests: number };
  if (counts.numTotalTests === 0) failures.push('no test ran');
  if (failures.length) process.stdout.write(`\nfailed steps: ${failures.join(', ')}\n`);
  process.stdout.write(`${counts.numPassedTests} passed, ${counts.numFailedTests} failed\n`);
} else {
  process.stdout.write(`\nfailed steps: ${failures.join(', ')}; vitest wrote no report\n0 passed, 0 failed\n`);
}
process.exitCode = failures.length ? 1 : 0;
