// One implementation of every import, used by `osmia import`, `osmia seed --demo` and POST /api/imports.
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import { basename } from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { ImportKind } from '#shared/schemas/enums.ts';
import { isKnownTimeZone } from '#shared/schemas/common.ts';
import { importColumns, optionalColumns, type ImportRecord } from '#shared/schemas/imports.ts';
import type { Db } from '../db/client.ts';
import {
  copyRejects,
  findLandedImport,
  finishImport,
  hasLandedFingerprint,
  getImport,
  insertRunningImport,
  sweepInterruptedImports,
} from '../db/queries/imports.ts';
import { insertSite, type SiteRow } from '../db/queries/sites.ts';
import { HttpError } from '../errors.ts';
import { resolveSite } from '../services/scope.ts';
import { applyColumnMap, type ColumnMap } from './column-map.ts';
import { RejectSink, type KindContext, type KindResult } from './context.ts';
import { ImportFileError } from './errors.ts';
import { importHistorian } from './historian.ts';
import { importAssets, importElements, importJobSteps, importTags, importWorkOrders } from './registers.ts';
import { openSource } from './source.ts';
import { TimestampReader } from '#shared/timestamps.ts';

export interface ImportOptions {
  kind: ImportKind;
  path: string;
  /** Name shown in the history (uploads keep the client's file name). */
  fileName?: string;
  site?: string;
  /** Time zone for naive timestamps; default the site's. A new site (assets import) takes it as its zone. */
  tz?: string;
  columnMap?: ColumnMap;
  strict?: boolean;
  dryRun?: boolean;
  actor: string;
  onProgress?: (p: { bytesRead: number; totalBytes: number; rowsRead: number }) => void;
  /** Called once the import record exists (not in a dry run), with its id. */
  onStart?: (importId: number) => void;
}

const importers: Record<ImportKind, (ctx: KindContext) => Promise<KindResult>> = {
  historian: importHistorian,
  tags: importTags,
  assets: importAssets,
  'work-orders': importWorkOrders,
  elements: importElements,
  'job-steps': importJobSteps,
};

/** sha256 of the size and the first and last megabyte: cheap, and equal for equal files. */
export async function fileFingerprint(path: string, size: number): Promise<string> {
  const fh = await open(path, 'r');
  try {
    const mb = 1 << 20;
    const head = Buffer.alloc(Math.min(mb, size));
    const tail = Buffer.alloc(Math.min(mb, size));
    await fh.read(head, 0, head.length, 0);
    await fh.read(tail, 0, tail.length, Math.max(0, size - mb));
    return createHash('sha256').update(String(size)).update(head).update(tail).digest('hex');
  } finally {
    await fh.close();
  }
}

async function isZip(path: string): Promise<boolean> {
  const fh = await open(path, 'r');
  try {
    const b = Buffer.alloc(2);
    await fh.read(b, 0, 2, 0);
    return b[0] === 0x50 && b[1] === 0x4b;
  } finally {
    await fh.close();
  }
}

export async function sha256File(path: string): Promise<string> {
  const hash = createHash('sha256');
  await pipeline(createReadStream(path, { highWaterMark: 1 << 20 }), hash);
  return hash.digest('hex');
}

/** The site an import is for: named, the only one (services/scope.ts resolves both), or — an asset register only — a new one. */
async function siteForImport(db: Db, opts: ImportOptions): Promise<SiteRow | { create: string }> {
  try {
    return await resolveSite(db, opts.site);
  } catch (err) {
    if (opts.kind === 'assets' && opts.site && err instanceof HttpError && err.code === 'site-not-found') return { create: opts.site };
    throw err;
  }
}

function checkHeader(kind: ImportKind, columns: string[]): void {
  const seen = new Map<string, number>();
  columns.forEach((c, i) => {
    if (c === '') return;
    if (seen.has(c)) throw new ImportFileError(`Column "${c}" appears twice in the header (columns ${seen.get(c)! + 1} and ${i + 1}).`);
    seen.set(c, i);
  });
  if (kind === 'historian') {
    if (columns[0] !== 'timestamp') {
      throw new ImportFileError(
        `The header must start with "timestamp" (long format: timestamp,tag,value[,quality]; wide: timestamp,<tag>,<tag>…); got "${columns.join(',').slice(0, 120)}". ` +
          'If the export names it otherwise, pass a column map (--map).',
      );
    }
    if (columns.length < 2) throw new ImportFileError('The header has only a timestamp column: expected tag columns, or tag,value for the long format.');
    return;
  }
  const required = importColumns[kind].filter((c) => !optionalColumns[kind]?.includes(c));
  const missing = required.filter((c) => !seen.has(c));
  if (missing.length > 0) {
    const hint = columns.length === 1 && /[;,\t|]/.test(columns[0]) ? ' (is the delimiter one of , ; or tab?)' : '';
    throw new ImportFileError(`Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}${hint}. Expected: ${importColumns[kind].join(',')}.`);
  }
}

/**
 * Import one file atomically: every row of it lands in one transaction with its import record, or
 * nothing does. The same file (same sha256, kind and site) a second time is recorded as a duplicate
 * and changes nothing. Rows that fail validation are rejected with line and reason; with `strict`
 * one reject refuses the file.
 */
export async function runImport(db: Db, opts: ImportOptions): Promise<ImportRecord> {
  const t0 = Date.now();
  const fileName = opts.fileName ?? basename(opts.path);
  const startedAt = new Date().toISOString();
  const totalBytes = (await stat(opts.path)).size;
  // A file seen before is hashed whole before anything else, so a duplicate costs one read; a new
  // CSV is hashed as it is parsed (one read instead of two). "Seen before" is a fingerprint of its
  // size and first and last megabyte, kept with each import.
  const fingerprint = await fileFingerprint(opts.path, totalBytes);
  let sha256 = '';
  await sweepInterruptedImports(db.$client);

  const record = (partial: Partial<ImportRecord>): ImportRecord => ({
    id: null,
    kind: opts.kind,
    site: null,
    file: fileName,
    sha256,
    status: 'failed',
    rowsRead: 0,
    rowsInserted: 0,
    rowsUpdated: 0,
    rowsUnchanged: 0,
    rowsRejected: 0,
    rejects: [],
    durationMs: Date.now() - t0,
    actor: opts.actor,
    startedAt,
    dryRun: Boolean(opts.dryRun),
    notes: {},
    error: null,
    derivedRefreshed: false,
    ...partial,
  });

  // Before anything is written: an unknown zone would otherwise fail the import after its record exists.
  if (opts.tz !== undefined && !isKnownTimeZone(opts.tz)) {
    return record({ error: `Unknown time zone "${opts.tz}": expected an IANA name such as Europe/Berlin or UTC.` });
  }

  let site: SiteRow | { create: string };
  try {
    site = await siteForImport(db, opts);
  } catch (err) {
    if (err instanceof HttpError) return record({ error: err.message });
    throw err;
  }
  const siteId = 'id' in site ? site.id : null;
  const siteCode = 'id' in site ? site.code : site.create;
  const options = {
    site: siteCode,
    tz: opts.tz ?? null,
    strict: Boolean(opts.strict),
    columnMap: opts.columnMap ? Object.fromEntries(opts.columnMap) : null,
    fingerprint,
  };

  const seenBefore = siteId !== null && (await hasLandedFingerprint(db.$client, siteId, opts.kind, fingerprint));
  if (seenBefore || (await isZip(opts.path))) sha256 = await sha256File(opts.path);
  if (sha256 && siteId !== null && (await findLandedImport(db.$client, siteId, opts.kind, sha256)) !== undefined) {
    if (opts.dryRun) return record({ site: siteCode, status: 'duplicate', notes: { duplicateOf: await findLandedImport(db.$client, siteId, opts.kind, sha256) } });
    return recordDuplicate(db, { siteId, kind: opts.kind, fileName, sha256, actor: opts.actor, options, t0 });
  }

  const client = await db.$client.connect();
  // A connection cut mid-import errors the client; the failing query reports it, so only listen.
  let broken = false;
  const onClientError = () => {
    broken = true;
  };
  client.on('error', onClientError);
  let importId: number | null = null;
  const rejects = new RejectSink();
  const notes: Record<string, unknown> = {};
  let result: KindResult = { rowsRead: 0, rowsInserted: 0, rowsUpdated: 0, rowsUnchanged: 0 };
  let finalSiteId = siteId;
  try {
    if (!opts.dryRun) {
      importId = await insertRunningImport(client, { siteId, kind: opts.kind, fileName, sha256: sha256 || `pending:${fingerprint}`, actor: opts.actor, options });
      opts.onStart?.(importId);
    }
    await client.query('begin');
    try {
      let siteRow: SiteRow;
      if ('id' in site) siteRow = site;
      else siteRow = await insertSite(client, { code: site.create, name: site.create, timeZone: opts.tz ?? 'UTC' });
      finalSiteId = siteRow.id;
      const time = new TimestampReader(opts.tz ?? siteRow.timeZone);
      const source = await openSource(opts.path);
      const columns = applyColumnMap(source.header, opts.columnMap);
      checkHeader(opts.kind, columns);
      const ctx: KindContext = {
        client,
        importId,
        site: siteRow,
        source,
        columns,
        time,
        decimalComma: source.delimiter === ';',
        rejects,
        notes,
        progress: (rowsRead) => opts.onProgress?.({ bytesRead: source.bytesRead(), totalBytes, rowsRead }),
      };
      result = await importers[opts.kind](ctx);
      if (!sha256) {
        sha256 = source.sha256() ?? (await sha256File(opts.path));
        // The same content landed before under another fingerprint (possible only by collision of
        // size and both ends): this run is a duplicate after all.
        if ((await findLandedImport(client, finalSiteId, opts.kind, sha256)) !== undefined) {
          await client.query('rollback');
          if (importId === null) return record({ site: siteCode, status: 'duplicate' });
          await finishImport(client, importId, { ...zeroCounts, sha256, siteId: finalSiteId, status: 'duplicate', durationMs: Date.now() - t0, notes: {}, error: null });
          return (await getImport(db.$client, importId))!;
        }
      }
      notes.format = source.format;
      if (source.delimiter) notes.delimiter = source.delimiter;
      if (time.dst.gapShifted) notes.dstGapShifted = time.dst.gapShifted;
      if (time.dst.repeatResolved) notes.dstRepeatResolved = time.dst.repeatResolved;
      if (rejects.count > rejects.kept.length) notes.rejectsNotStored = rejects.count - rejects.kept.length;
      if (opts.strict && rejects.count > 0) {
        throw new ImportFileError(`--strict: ${rejects.count} row${rejects.count > 1 ? 's were' : ' was'} rejected, so the whole file was refused.`, rejects.kept);
      }
      const status = rejects.count > 0 ? 'partial' : 'completed';
      if (opts.dryRun) {
        await client.query('rollback');
        return record({ site: siteCode, status, ...result, rowsRejected: rejects.count, rejects: rejects.kept.slice(0, 100), notes });
      }
      await copyRejects(client, importId!, rejects.kept);
      await finishImport(client, importId!, {
        sha256,
        siteId: finalSiteId,
        status,
        rowsRead: result.rowsRead,
        rowsInserted: result.rowsInserted,
        rowsUnchanged: result.rowsUnchanged,
        rowsRejected: rejects.count,
        durationMs: Date.now() - t0,
        notes: { ...notes, rowsUpdated: result.rowsUpdated },
        error: null,
      });
      await client.query('commit');
    } catch (err) {
      await client.query('rollback').catch(() => undefined);
      // Another import of the same file landed while this one ran: this one is the duplicate.
      if ((err as { constraint?: string }).constraint === 'imports_landed_key' && importId !== null) {
        await finishImport(client, importId, { ...zeroCounts, sha256, siteId: finalSiteId, status: 'duplicate', durationMs: Date.now() - t0, notes: {}, error: null });
        return (await getImport(db.$client, importId))!;
      }
      const message = err instanceof ImportFileError ? err.message : `Import failed, nothing was kept: ${(err as Error).message}`;
      const kept = err instanceof ImportFileError ? err.rejects : [];
      if (importId === null) return record({ site: siteCode, error: message, rowsRejected: kept.length, rejects: kept.slice(0, 100) });
      await copyRejects(client, importId, kept);
      await finishImport(client, importId, {
        sha256: sha256 || `pending:${fingerprint}`,
        siteId,
        status: 'failed',
        rowsRead: result.rowsRead,
        rowsInserted: 0,
        rowsUnchanged: 0,
        rowsRejected: kept.length,
        durationMs: Date.now() - t0,
        notes,
        error: message,
      });
      if (!(err instanceof ImportFileError)) throw Object.assign(err as Error, { importId });
    }
  } finally {
    if (importId !== null) await client.query('select pg_advisory_unlock(2, $1)', [importId]).catch(() => undefined);
    client.off('error', onClientError);
    client.release(broken);
  }
  return (await getImport(db.$client, importId!))!;
}

const zeroCounts = { rowsRead: 0, rowsInserted: 0, rowsUnchanged: 0, rowsRejected: 0 };

async function recordDuplicate(
  db: Db,
  v: { siteId: number; kind: ImportKind; fileName: string; sha256: string; actor: string; options: object; t0: number },
): Promise<ImportRecord> {
  const client = await db.$client.connect();
  try {
    const id = await insertRunningImport(client, v);
    await finishImport(client, id, { ...zeroCounts, sha256: v.sha256, siteId: v.siteId, status: 'duplicate', durationMs: Date.now() - v.t0, notes: {}, error: null });
    await client.query('select pg_advisory_unlock(2, $1)', [id]);
    return (await getImport(db.$client, id))!;
  } finally {
    client.release();
  }
}
