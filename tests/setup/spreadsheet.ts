// Reading the workbooks Osmia writes, three ways: with exceljs (cells, formulas, formats), as the raw XML of
// a sheet (what a spreadsheet program will see: cell types, <f> elements), and recalculated by a real
// spreadsheet engine — LibreOffice, headless, from Debian's libreoffice-calc-nogui — which loads the file,
// recomputes every formula and writes each sheet as CSV.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import Papa from 'papaparse';
import type { Response } from 'supertest';

/** supertest: collect a binary body (an XLSX download) into a Buffer. */
export function binaryBody(res: Response, callback: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => callback(null, Buffer.concat(chunks)));
}

export async function openWorkbook(data: Buffer): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(data as unknown as ArrayBuffer);
  return wb;
}

/** The raw XML of a sheet by its name, and the workbook's shared strings in order. */
export async function sheetXml(data: Buffer, sheetName: string): Promise<{ xml: string; sharedStrings: string[] }> {
  const zip = await JSZip.loadAsync(data);
  const book = await zip.file('xl/workbook.xml')!.async('string');
  const rels = await zip.file('xl/_rels/workbook.xml.rels')!.async('string');
  const escaped = sheetName.replace(/&/g, '&amp;').replace(/'/g, '&apos;');
  const sheet = new RegExp(`<sheet [^>]*name="${escaped.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}"[^>]*r:id="([^"]+)"`).exec(book);
  if (!sheet) throw new Error(`no sheet named ${sheetName}`);
  const target = new RegExp(`<Relationship [^>]*Id="${sheet[1]}"[^>]*Target="([^"]+)"`).exec(rels)?.[1];
  if (!target) throw new Error(`no part for sheet ${sheetName}`);
  const xml = await zip.file(`xl/${target.replace(/^\/?xl\//, '')}`)!.async('string');
  const ss = (await zip.file('xl/sharedStrings.xml')?.async('string')) ?? '';
  const sharedStrings = [...ss.matchAll(/<si>([\s\S]*?)<\/si>/g)].map((m) => unescapeXml([...m[1]!.matchAll(/<t[^>]*>([\s\S]*?)<\/t>/g)].map((t) => t[1]).join('')));
  return { xml, sharedStrings };
}

const unescapeXml = (s: string) => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, '&');

/**
 * The text a string cell element holds: a shared string (t="s"), a string value (t="str") or an inline
 * string (t="inlineStr"); null for any other cell.
 */
export function cellText(cell: string, sharedStrings: readonly string[]): string | null {
  const type = /^<c [^>]*\bt="([^"]+)"/.exec(cell)?.[1];
  if (type === 's') return sharedStrings[Number(/<v>(\d+)<\/v>/.exec(cell)?.[1])] ?? null;
  if (type === 'str') return unescapeXml(/<v>([\s\S]*?)<\/v>/.exec(cell)?.[1] ?? '');
  if (type === 'inlineStr') return unescapeXml([...cell.matchAll(/<t[^>]*>([\s\S]*?)<\/t>/g)].map((m) => m[1]).join(''));
  return null;
}

/** The `<c r="…">…</c>` element of one cell in a sheet's XML, or null. */
export function cellElement(xml: string, address: string): string | null {
  return new RegExp(`<c r="${address}"(?:\\s[^>]*)?(?:/>|>[\\s\\S]*?</c>)`).exec(xml)?.[0] ?? null;
}

/** A number cell of exceljs: the value, or a formula's cached result. */
export function numberOf(cell: ExcelJS.Cell): number | null {
  const v = cell.value;
  if (typeof v === 'number') return v;
  if (v && typeof v === 'object' && 'formula' in v) return typeof v.result === 'number' ? v.result : null;
  return null;
}

/** Within half a cent (money "to the cent"). */
export function sameCents(a: number | null | undefined, b: number | null | undefined): boolean {
  return typeof a === 'number' && typeof b === 'number' && Math.abs(a - b) < 0.005;
}

/** The first row whose column A reads `text`. */
export function rowStartingWith(ws: ExcelJS.Worksheet, text: string): ExcelJS.Row {
  for (let r = 1; r <= ws.rowCount; r++) if (ws.getRow(r).getCell(1).value === text) return ws.getRow(r);
  throw new Error(`no row "${text}" in ${ws.name}`);
}

/** LibreOffice's headless binary, or null when it is not installed (the recalculation tests then skip, saying so). */
export const soffice: string | null = ['/usr/bin/soffice', '/usr/bin/libreoffice'].find((p) => existsSync(p)) ?? null;

// A private LibreOffice profile that recalculates every formula of an XLSX on load (Tools > Options >
// Calc > Formula > "Recalculation on file load": always). Without it LibreOffice keeps the cached results
// of a file written by another program, and a wrong formula would go unseen.
const recalcAlways = `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="ODFRecalcMode" oor:op="fuse"><value>0</value></prop></item>
</oor:items>
`;

/**
 * Opens each file in LibreOffice, which recalculates it, and reads back every sheet as CSV (raw values,
 * not as shown): file → sheet name → rows of cells as text.
 */
export function recalculate(files: readonly string[]): Map<string, Map<string, string[][]>> {
  if (!soffice) throw new Error('LibreOffice is not installed');
  const work = mkdtempSync(join(tmpdir(), 'osmia-calc-'));
  try {
    const profile = join(work, 'profile');
    mkdirSync(join(profile, 'user'), { recursive: true });
    writeFileSync(join(profile, 'user', 'registrymodifications.xcu'), recalcAlways);
    const out = join(work, 'out');
    // Field separator 44 (,), text delimiter 34 ("), UTF-8 (76), from line 1, values not as shown, every sheet (-1).
    const filter = 'csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1';
    const r = spawnSync(soffice, [`-env:UserInstallation=file://${profile}`, '--headless', '--norestore', '--convert-to', filter, '--outdir', out, ...files], {
      encoding: 'utf8',
      timeout: 180_000,
    });
    if (r.status !== 0) throw new Error(`soffice failed (${r.status}): ${r.stderr}`);
    const result = new Map<string, Map<string, string[][]>>();
    const written = existsSync(out) ? readdirSync(out) : [];
    for (const file of files) {
      const base = basename(file).replace(/\.xlsx$/, '');
      const sheets = new Map<string, string[][]>();
      for (const csv of written.filter((f) => f.startsWith(`${base}-`) && f.endsWith('.csv'))) {
        const name = csv.slice(base.length + 1, -4);
        sheets.set(name, Papa.parse<string[]>(readFileSync(join(out, csv), 'utf8'), { skipEmptyLines: false }).data);
      }
      if (sheets.size === 0) throw new Error(`LibreOffice wrote no sheet of ${file}: ${r.stdout} ${r.stderr}`);
      result.set(file, sheets);
    }
    return result;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
