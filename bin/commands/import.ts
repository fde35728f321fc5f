import { existsSync, statSync } from 'node:fs';
import { userInfo } from 'node:os';
import type { Command } from 'commander';
import cliProgress from 'cli-progress';
import { importKinds, type ImportKind } from '#shared/schemas/enums.ts';
import type { ImportRecord } from '#shared/schemas/imports.ts';
import { parseColumnMap, readColumnMap, type ColumnMap } from '#server/importers/column-map.ts';
import { importFile } from '#server/services/imports.ts';
import { isTerminal } from '../config.ts';
import { formatJson, formatNumber, formatTable, stdio } from '../output.ts';
import { action, CliError } from '../run.ts';
import { withDb } from './db.ts';

interface ImportFlags {
  site?: string;
  tz?: string;
  map?: string;
  column?: string[];
  strict?: boolean;
  dryRun?: boolean;
  refresh: boolean;
  json?: boolean;
}

/** Exit code of a set of imports: 1 if any failed, else 3 if any row was rejected, else 0. */
export function importExitCode(records: ImportRecord[]): number {
  if (records.some((r) => r.status === 'failed')) return 1;
  if (records.some((r) => r.rowsRejected > 0)) return 3;
  return 0;
}

export function formatImportSummary(records: ImportRecord[]): string {
  const table = formatTable(
    ['file', 'kind', 'status', 'read', 'inserted', 'updated', 'unchanged', 'rejected', 'refreshed', 'seconds'],
    records.map((r) => [r.file, r.kind, r.status, r.rowsRead, r.rowsInserted, r.rowsUpdated, r.rowsUnchanged, r.rowsRejected, r.derivedRefreshed ? 'yes' : 'no', Math.round(r.durationMs / 100) / 10]),
  );
  const details: string[] = [];
  for (const r of records) {
    if (r.error) details.push(`${r.file}: ${r.error}`);
    for (const j of r.rejects.slice(0, 10)) details.push(`${r.file}:${j.line}: ${j.reason}`);
    if (r.rowsRejected > 10) details.push(`${r.file}: … ${r.rowsRejected - 10} more rejects${r.id ? ` (GET /api/imports/${r.id}/rejects.csv)` : ''}`);
    const dst = [r.notes.dstGapShifted && `${r.notes.dstGapShifted} local times in a daylight-saving gap moved forward`, r.notes.dstRepeatResolved && `${r.notes.dstRepeatResolved} in a repeated hour resolved`].filter(Boolean);
    if (dst.length) details.push(`${r.file}: ${dst.join('; ')}`);
    if (typeof r.notes.refreshError === 'string') details.push(`${r.file}: imported, but the refresh after it failed (${r.notes.refreshError}): run "bin/osmia refresh".`);
  }
  const landed = records.filter((r) => r.status === 'completed' || r.status === 'partial');
  if (landed.some((r) => !r.derivedRefreshed && r.notes.refreshError === undefined)) {
    details.push('Derived data (hourly rollups, stop events) not refreshed (--no-refresh): run "bin/osmia refresh" after the last file, before asking for KPIs.');
  }
  return [table, ...details].join('\n');
}

function columnMapFrom(flags: ImportFlags): ColumnMap | undefined {
  let map: ColumnMap | undefined;
  try {
    if (flags.map) {
      if (!existsSync(flags.map)) throw new Error(`column map file not found: ${flags.map}`);
      map = readColumnMap(flags.map);
    }
    if (flags.column?.length) {
      const extra = parseColumnMap(flags.column.join('\n'));
      map = new Map([...(map ?? []), ...extra]);
    }
  } catch (err) {
    throw new CliError((err as Error).message, 2);
  }
  return map;
}

export function registerImport(program: Command) {
  program
    .command('import')
    .description('import historian exports and maintenance registers (CSV; XLSX for registers and work orders)')
    .argument('<kind>', importKinds.join('|'))
    .argument('<files...>', 'files to import, in order')
    .option('--site <code>', 'site code (optional when only one site exists; an assets import creates it)')
    .option('--tz <zone>', 'IANA time zone of naive timestamps (default: the site’s)')
    .option('--map <file>', 'column map: JSON {"Their header":"our_header"} or lines Their header=our_header')
    .option('--column <their=ours>', 'rename one column (repeatable)', (v: string, acc: string[] = []) => [...acc, v])
    .option('--strict', 'refuse the whole file when any row is rejected')
    .option('--dry-run', 'check everything, keep nothing')
    .option('--no-refresh', 'leave the hourly rollups and stop events to one `osmia refresh` after a bulk load of many files')
    .option('--json', 'print the import record(s) as JSON')
    .action(
      action(async (kind: string, files: string[], flags: ImportFlags) => {
        if (!(importKinds as readonly string[]).includes(kind)) throw new CliError(`unknown import kind "${kind}" (expected ${importKinds.join(', ')})`, 2);
        for (const f of files) if (!existsSync(f) || !statSync(f).isFile()) throw new CliError(`file not found: ${f}`);
        const columnMap = columnMapFrom(flags);
        const showProgress = isTerminal() && !flags.json;
        const records: ImportRecord[] = [];
        await withDb(async (db) => {
          for (const file of files) {
            const bar = showProgress
              ? new cliProgress.SingleBar(
                  { format: `${file.slice(-30).padEnd(30)} {bar} {percentage}% | {mb}/{totalMb} MB | {rows} rows | {rate} rows/s`, hideCursor: true, clearOnComplete: true },
                  cliProgress.Presets.shades_classic,
                )
              : undefined;
            const t0 = Date.now();
            bar?.start(100, 0, { mb: '0', totalMb: '?', rows: 0, rate: 0 });
            const record = await importFile(db, {
              kind: kind as ImportKind,
              path: file,
              site: flags.site,
              tz: flags.tz,
              columnMap,
              strict: flags.strict,
              dryRun: flags.dryRun,
              refresh: flags.refresh,
              actor: `cli:${userInfo().username}`,
              onProgress: (p) =>
                bar?.update(p.totalBytes ? Math.min(100, Math.round((100 * p.bytesRead) / p.totalBytes)) : 0, {
                  mb: (p.bytesRead / 1e6).toFixed(1),
                  totalMb: (p.totalBytes / 1e6).toFixed(1),
                  rows: formatNumber(p.rowsRead),
                  rate: formatNumber(Math.round(p.rowsRead / Math.max(0.001, (Date.now() - t0) / 1000))),
                }),
            });
            bar?.stop();
            records.push(record);
          }
        });
        stdio.out(flags.json ? formatJson(records.length === 1 ? records[0] : records) : formatImportSummary(records));
        return importExitCode(records);
      }),
    );
}
