// The nightly run's inbox folder (docs/design.md §7):
//   <inbox>/                          files waiting (any name; a leading dot or .part/.tmp: still being written)
//   <inbox>/done/<date>/<file>        imported (and <file>.reason.txt with the rejected rows of a partial import)
//   <inbox>/failed/<date>/<file>      refused, with <file>.reason.txt saying why
// A file is moved only after its import record is committed, by one rename on the same file system, so a
// run killed at any moment leaves each file either waiting (and the next run finds its import, if it
// landed, by its sha256) or moved — never half-moved and never lost.
import { existsSync } from 'node:fs';
import { mkdir, readdir, rename, writeFile } from 'node:fs/promises';
import { extname, join, relative } from 'node:path';

/** Names a writer uses while a file is not complete yet, and the run's own reason files. */
export function isWaiting(name: string): boolean {
  return !name.startsWith('.') && !/\.(part|partial|tmp|crdownload)$/i.test(name) && !name.endsWith('.reason.txt');
}

/** The regular files waiting in the inbox (created when missing), by name. */
export async function listInbox(inbox: string): Promise<string[]> {
  await mkdir(inbox, { recursive: true });
  const entries = await readdir(inbox, { withFileTypes: true });
  return entries
    .filter((e) => e.isFile() && isWaiting(e.name))
    .map((e) => e.name)
    .sort((a, b) => a.localeCompare(b, 'en', { numeric: true }));
}

/** A name not yet taken in `dir`: the file's own, else name-2.ext, name-3.ext… */
function freeName(dir: string, name: string): string {
  if (!existsSync(join(dir, name))) return name;
  const ext = extname(name);
  const stem = name.slice(0, name.length - ext.length);
  for (let i = 2; ; i++) {
    const candidate = `${stem}-${i}${ext}`;
    if (!existsSync(join(dir, candidate))) return candidate;
  }
}

/**
 * Move a file of the inbox to done/<date>/ or failed/<date>/, its reason file (when given) written first,
 * whole (a temporary name, then a rename). Answers the new path relative to the inbox.
 */
export async function moveFromInbox(inbox: string, name: string, to: 'done' | 'failed', date: string, reason?: string): Promise<string> {
  const dir = join(inbox, to, date);
  await mkdir(dir, { recursive: true });
  const target = freeName(dir, name);
  if (reason !== undefined) {
    const tmp = join(dir, `.${target}.reason.txt.tmp`);
    await writeFile(tmp, reason.endsWith('\n') ? reason : `${reason}\n`);
    await rename(tmp, join(dir, `${target}.reason.txt`));
  }
  await rename(join(inbox, name), join(dir, target));
  return relative(inbox, join(dir, target));
}
