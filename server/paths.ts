import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The checkout's root: the nearest folder above this module whose package.json is Osmia's. Found by
 * walking up rather than by a fixed '../..' because the CLI also runs from a bundle (bin/osmia).
 */
function findRoot(): string {
  for (let dir = dirname(fileURLToPath(import.meta.url)); ; dir = dirname(dir)) {
    const pkg = join(dir, 'package.json');
    if (existsSync(pkg) && (JSON.parse(readFileSync(pkg, 'utf8')) as { name?: string }).name === 'osmia') return dir;
    if (dirname(dir) === dir) throw new Error('cannot find the Osmia checkout (package.json) above ' + fileURLToPath(import.meta.url));
  }
}

export const projectRoot = findRoot();
