// Which importer a file is for, read from its header alone: the canonical headers of docs/design.md §5
// (shared/schemas/imports.ts). Used by the nightly run, whose inbox holds files of every kind.
import { createReadStream } from 'node:fs';
import type ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { ImportKind } from '#shared/schemas/enums.ts';
import { importColumns, optionalColumns } from '#shared/schemas/imports.ts';
import { applyColumnMap, type ColumnMap } from './column-map.ts';
import { detectDelimiter, peek } from './source.ts';

export type DetectedKind = { kind: ImportKind; format: 'csv' | 'xlsx' } | { kind: null; reason: string };

/** The kinds a header can be read as, without the historian (told by its first column). */
const registerKinds = (Object.keys(importColumns) as ImportKind[]).filter((k) => k !== 'historian');

/** The first row of an XLSX workbook's first sheet; the file is closed as soon as it is read. */
async function xlsxHeader(path: string): Promise<string[]> {
  const { default: Excel } = await import('exceljs');
  const input = createReadStream(path);
  try {
    const reader = new Excel.stream.xlsx.WorkbookReader(input, { sharedStrings: 'cache', hyperlinks: 'ignore', styles: 'ignore', worksheets: 'emit' });
    for await (const sheet of reader) {
      for await (const row of sheet as unknown as AsyncIterable<ExcelJS.Row>) {
        return (row.values as ExcelJS.CellValue[]).slice(1).map((v) => (v === null || v === undefined ? '' : typeof v === 'object' && 'richText' in v ? v.richText.map((r) => r.text).join('') : String(v)));
      }
      return [];
    }
    return [];
  } finally {
    input.destroy();
  }
}

/**
 * The kind of import a file's header names. A header whose first column is `timestamp` is a historian
 * export (long or wide: the importer tells them apart); otherwise the register kind whose required columns
 * are all present — when two would fit, the one with more of its columns present, and no kind at all when
 * that still ties. Historian exports are CSV only, as the importer reads them (docs/design.md §5).
 */
export async function detectKind(path: string, columnMap?: ColumnMap): Promise<DetectedKind> {
  let start: Buffer;
  try {
    start = await peek(path, 64 * 1024);
  } catch (err) {
    return { kind: null, reason: `The file could not be read: ${(err as Error).message}` };
  }
  if (start.length === 0) return { kind: null, reason: 'The file is empty: expected a header line and rows.' };
  const xlsx = start[0] === 0x50 && start[1] === 0x4b;
  let header: string[];
  if (xlsx) {
    try {
      header = await xlsxHeader(path);
    } catch (err) {
      return { kind: null, reason: `The file is not a readable XLSX workbook: ${(err as Error).message}` };
    }
  } else {
    if (start.includes(0)) return { kind: null, reason: 'The file is not text (binary content): expected a UTF-8 CSV or an XLSX workbook.' };
    const bom = start[0] === 0xef && start[1] === 0xbb && start[2] === 0xbf;
    const firstLine = start.toString('utf8', bom ? 3 : 0).split(/\r\n|\n|\r/, 1)[0] ?? '';
    header = Papa.parse<string[]>(firstLine, { delimiter: detectDelimiter(firstLine) }).data[0] ?? [];
  }
  const columns = applyColumnMap(header, columnMap);
  const shown = columns.join(',').slice(0, 160);
  if (columns.every((c) => c === '')) return { kind: null, reason: 'The first line is empty: expected a header line.' };
  if (columns[0] === 'timestamp') {
    if (xlsx) return { kind: null, reason: 'A historian export must be CSV (only registers and work orders are read from XLSX).' };
    return { kind: 'historian', format: 'csv' };
  }
  const present = new Set(columns);
  const fits = registerKinds
    .filter((kind) => importColumns[kind].filter((c) => !optionalColumns[kind]?.includes(c)).every((c) => present.has(c)))
    .map((kind) => ({ kind, matched: importColumns[kind].filter((c) => present.has(c)).length }))
    .sort((a, b) => b.matched - a.matched);
  if (fits.length === 0 || (fits.length > 1 && fits[0].matched === fits[1].matched)) {
    return {
      kind: null,
      reason:
        fits.length === 0
          ? `The header "${shown}" is none of the import formats: expected a historian export (timestamp,…) or the columns of assets, tags, elements, work orders or job steps (README, Import formats).`
          : `The header "${shown}" fits both ${fits[0].kind} and ${fits[1].kind}: import it by hand with bin/osmia import <kind>.`,
    };
  }
  return { kind: fits[0].kind, format: xlsx ? 'xlsx' : 'csv' };
}
