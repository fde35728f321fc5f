// Stored workbooks: the nightly run writes them into reports/<YYYY-MM-DD>/ (a folder per day); the API
// lists them and hands one out. A name is accepted only when it matches the workbook pattern
// (shared/schemas/reports.ts) and the path it makes stays inside the reports folder, also after symbolic
// links are followed: no "..", no absolute path, no link out of the folder reaches a file.
import { lstat, readdir, realpath } from 'node:fs/promises';
import { join, resolve, sep } from 'node:path';
import type { Role } from '#shared/schemas/enums.ts';
import { storedDateSchema, storedFileNamePattern, type ReportName, type StoredReport } from '#shared/schemas/reports.ts';
import { HttpError, notFound } from '../errors.ts';
import { projectRoot } from '../paths.ts';
import { workbookNamed } from './catalog.ts';

/** Where workbooks go when nothing else is said (REPORTS_DIR, `--out`): reports/ at the project root. */
export const defaultReportsDir = join(projectRoot, 'reports');

/** The workbook, site and window a stored file's name gives, or null for a file that is not a workbook. */
export function parseStoredName(file: string): { name: ReportName; site: string; from: string; to: string } | null {
  const m = storedFileNamePattern.exec(file);
  return m ? { name: m[1] as ReportName, site: m[2]!, from: m[3]!, to: m[4]! } : null;
}

async function isInside(dir: string, path: string): Promise<boolean> {
  const [root, real] = await Promise.all([realpath(dir), realpath(path)]);
  return real.startsWith(root + sep);
}

/** The stored workbooks the role may download, newest folder first. A missing reports folder holds none. */
export async function listStoredReports(dir: string, role: Role): Promise<StoredReport[]> {
  let days;
  try {
    days = await readdir(dir, { withFileTypes: true });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  const out: StoredReport[] = [];
  for (const day of days) {
    if (!day.isDirectory() || !storedDateSchema.safeParse(day.name).success) continue;
    const folder = join(dir, day.name);
    for (const file of await readdir(folder)) {
      const parsed = parseStoredName(file);
      if (!parsed || !workbookNamed(parsed.name).access.includes(role)) continue;
      const info = await lstat(join(folder, file));
      if (!info.isFile()) continue;
      out.push({
        date: day.name,
        file,
        ...parsed,
        bytes: info.size,
        modifiedAt: info.mtime.toISOString(),
        url: `/api/reports/stored/${day.name}/${file}`,
      });
    }
  }
  return out.sort((a, b) => (a.date !== b.date ? (a.date < b.date ? 1 : -1) : a.file < b.file ? -1 : a.file > b.file ? 1 : 0));
}

/**
 * The path of a stored workbook, for a date and file name already checked with storedReportParamsSchema.
 * Not there (or not a plain file inside the folder): 404 report-not-found; a workbook the role may not
 * have: 403, as the route of that workbook refuses it.
 */
export async function storedReportPath(dir: string, date: string, file: string, role: Role): Promise<string> {
  const parsed = parseStoredName(file);
  if (!parsed) throw notFound('report-not-found');
  if (!workbookNamed(parsed.name).access.includes(role)) {
    throw new HttpError(403, 'forbidden', `The ${parsed.name} workbook is not available to your role.`);
  }
  const root = resolve(dir);
  const path = resolve(root, date, file);
  const missing = notFound('report-not-found', `No stored workbook ${date}/${file}.`);
  if (!path.startsWith(root + sep)) throw missing;
  try {
    const info = await lstat(path);
    if (!info.isFile() || !(await isInside(root, path))) throw missing;
  } catch (err) {
    if (err === missing) throw err;
    if ((err as NodeJS.ErrnoException).code === 'ENOENT' || (err as NodeJS.ErrnoException).code === 'ENOTDIR') throw missing;
    throw err;
  }
  return path;
}
