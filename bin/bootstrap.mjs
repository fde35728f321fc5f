#!/usr/bin/env node
// `npm start` and `npm test` from a fresh clone: install dependencies when node_modules is missing,
// then hand over to the TypeScript entry points (which start PostgreSQL themselves).
// Plain JavaScript on purpose: it must run before any dependency is installed.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const mode = process.argv[2];

function sh(cmd, args, options = {}) {
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', ...options });
  if (r.error) throw r.error;
  return r.status ?? 1;
}

function ensureDependencies() {
  const marker = join(root, 'node_modules', '.package-lock.json');
  const stale =
    !existsSync(marker) ||
    !existsSync(join(root, 'node_modules', '.bin', 'tsx')) ||
    readFileSync(join(root, 'package-lock.json'), 'utf8').length === 0;
  if (!stale) return;
  console.error('Installing dependencies (npm ci)…');
  if (sh('npm', ['ci', '--no-audit', '--no-fund']) !== 0) {
    console.error('npm ci failed; see the messages above.');
    process.exit(1);
  }
}

ensureDependencies();
const tsx = join(root, 'node_modules', '.bin', 'tsx');
let status;
switch (mode) {
  case 'start':
    status = sh(join(root, 'bin', 'osmia'), ['serve', '--first-run', ...process.argv.slice(3)]);
    break;
  case 'test':
    status = sh(tsx, [join(root, 'tests', 'run.ts'), ...process.argv.slice(3)]);
    break;
  default:
    console.error('usage: node bin/bootstrap.mjs start|test');
    status = 2;
}
rmSync(join(root, '.vitest-tmp'), { recursive: true, force: true });
process.exit(status);
