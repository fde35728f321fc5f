// What both browser suites share: the client built as in production, the app listening on a free
// loopback port, and Debian's Chromium started headless with the flags this closed network needs.
import { mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { build } from 'vite';
import type { TestApp } from '../setup/app.ts';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** Build the client into a fresh temp folder; returns the folder. */
export async function buildClient(): Promise<string> {
  const dist = mkdtempSync(join(tmpdir(), 'osmia-client-'));
  // vitest runs with NODE_ENV=test; the client is built as in production (React's production build).
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ root, configFile: join(root, 'vite.config.ts'), logLevel: 'warn', build: { outDir: dist, emptyOutDir: true } });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
  return dist;
}

/** Listen on 127.0.0.1 at a free port; returns the server and its base URL. */
export async function listen(app: TestApp['app']): Promise<{ server: Server; base: string }> {
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  return { server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` };
}

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless=new', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/** Close what a suite opened, in order, and remove its temp folders. */
export async function tearDown(parts: { browser?: Browser; server?: Server; t?: TestApp; dirs: (string | undefined)[] }): Promise<void> {
  await parts.browser?.close();
  if (parts.server) {
    const server = parts.server;
    await new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeAllConnections();
  }
  await parts.t?.close();
  for (const dir of parts.dirs) if (dir) rmSync(dir, { recursive: true, force: true });
}
