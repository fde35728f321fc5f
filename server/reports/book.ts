// Writing a workbook: exceljs's streaming writer (rows leave for the zip as they are written, so a
// 200,000-row sheet never sits whole in memory), one table per sheet with its header frozen and
// filtered, units in the headers, a number format per column, dates in the site's clock.
//
// Text is always written as text. A JavaScript string becomes a string cell (t="str", its value and no <f>
// element); the only formulas in a workbook are `Formula` objects, which only the workbook modules make,
// from cell references they compute — never from imported text. A work-order description "=HYPERLINK(…)"
// therefore reaches the sheet as the characters it was imported as.
import { EventEmitter, once } from 'node:events';
import type { Writable } from 'node:stream';
import type ExcelJS from 'exceljs';

/** What a column holds; it decides the number format (and yes/no for flags). */
export type CellKind =
  | 'text'
  | 'integer'
  | 'decimal'
  | 'money'
  | 'hours'
  | 'days'
  | 'm3'
  | 'share'
  | 'pct'
  | 'probability'
  | 'rate'
  | 'datetime'
  | 'date'
  | 'flag';

const numberFormats: Record<CellKind, string> = {
  text: '@',
  integer: '#,##0',
  decimal: '#,##0.000',
  money: '#,##0.00',
  hours: '#,##0.00',
  days: '#,##0.0',
  m3: '#,##0.0',
  share: '0.0%',
  pct: '#,##0.0',
  probability: '0.00%',
  rate: '#,##0.0000',
  datetime: 'yyyy-mm-dd hh:mm',
  date: 'yyyy-mm-dd',
  flag: '@',
};

/**
 * A spreadsheet formula the workbook code built from cell references (`SUM(G2:G14)`), with the value
 * Osmia computed for it — the API's figure — as its cached result, so a reader that does not
 * recalculate sees the same number as one that does.
 */
export class Formula {
  constructor(
    readonly expression: string,
    readonly result: number | null,
  ) {}
}

export type CellInput = string | number | boolean | Date | null | undefined | Formula;

export interface ColumnSpec {
  /** With its unit: "Cost (EUR)", "Hours (h)". */
  header: string;
  kind: CellKind;
  /** Width in characters. */
  width: number;
}

/** Number formats for some cells of a row, by 0-based column: `formatsAt({ 8: 'rate' })`. */
export function formatsAt(kinds: Record<number, CellKind>): (CellKind | undefined)[] {
  const out: (CellKind | undefined)[] = [];
  for (const [i, k] of Object.entries(kinds)) out[Number(i)] = k;
  return Array.from(out, (k) => k);
}

/** Column letters of a 1-based column number: 1 → A, 27 → AA. */
export function columnLetter(column: number): string {
  let n = column;
  let out = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    out = String.fromCharCode(65 + r) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

/** `'Maintenance cost'!G14`: a reference another sheet's formula can use. */
export function sheetRef(sheet: string, column: number, row: number): string {
  return `'${sheet.replace(/'/g, "''")}'!${columnLetter(column)}${row}`;
}

/** `SUM(G2:G14)` over rows [first, last] of a column; `0` when the range is empty. */
export function sumOf(column: number, first: number, last: number): string {
  return last < first ? '0' : `SUM(${columnLetter(column)}${first}:${columnLetter(column)}${last})`;
}

const DAY_MS = 86_400_000;
/**
 * Span over which the zone's offset is looked up once. Offsets change at most twice a year in practice,
 * and no two changes of any zone in use lie within 16 days of each other, so a span whose two ends agree
 * has no change inside it (common practice: the tz database's rules are months apart).
 */
const SPAN_MS = 16 * DAY_MS;

/**
 * The site's wall clock for dates in cells: a spreadsheet date has no zone, so an instant is written as
 * the local date and time a person at the plant read then. The zone's offset is looked up (Intl) at the
 * ends of 16-day spans; within a span whose ends differ, at the ends of each day; within such a day, per
 * instant. A register of 200,000 dates over ten years costs a few hundred lookups.
 */
export class SiteClock {
  private readonly parts: Intl.DateTimeFormat;
  private readonly spanOffsets = new Map<number, number | null>();
  private readonly dayOffsets = new Map<number, number | null>();

  constructor(readonly timeZone: string) {
    this.parts = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
  }

  /** Offset of the zone from UTC at `ms`, in milliseconds (whole seconds). */
  private offsetAt(ms: number): number {
    const at = Math.floor(ms / 1000) * 1000;
    const p: Record<string, number> = {};
    for (const part of this.parts.formatToParts(at)) if (part.type !== 'literal') p[part.type] = Number(part.value);
    return Date.UTC(p.year!, p.month! - 1, p.day!, p.hour!, p.minute!, p.second!) - at;
  }

  /** The offset over [start, start + length) when it is the same at both ends, else null. */
  private steady(cache: Map<number, number | null>, key: number, start: number, length: number): number | null {
    let offset = cache.get(key);
    if (offset === undefined) {
      const first = this.offsetAt(start);
      offset = first === this.offsetAt(start + length - 1000) ? first : null;
      cache.set(key, offset);
    }
    return offset;
  }

  /** The local wall-clock time at `instant`, as a Date whose UTC fields read it (what exceljs writes). */
  wall(instant: Date): Date {
    const ms = instant.getTime();
    const span = Math.floor(ms / SPAN_MS);
    let offset = this.steady(this.spanOffsets, span, span * SPAN_MS, SPAN_MS);
    if (offset === null) {
      const day = Math.floor(ms / DAY_MS);
      offset = this.steady(this.dayOffsets, day, day * DAY_MS, DAY_MS) ?? this.offsetAt(ms);
    }
    return new Date(ms + offset);
  }
}

type Style = Partial<ExcelJS.Style>;
const headerStyle: Style = {
  font: { bold: true },
  alignment: { vertical: 'top', wrapText: true },
  fill: { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFE4ECEF' } },
  border: { bottom: { style: 'thin', color: { argb: 'FF7D8E96' } } },
};
const totalFont: Partial<ExcelJS.Font> = { bold: true };
const noteFont: Partial<ExcelJS.Font> = { italic: true, color: { argb: 'FF4A5A62' } };
const titleFont: Partial<ExcelJS.Font> = { bold: true, size: 13 };
const headingFont: Partial<ExcelJS.Font> = { bold: true };

/**
 * How a row of a table looks: data (inside the auto-filter), a total line, a heading above a block, a
 * note under it, or an aside — a figure under the table that looks like data but is not filtered with it.
 */
export type RowRole = 'data' | 'total' | 'heading' | 'note' | 'aside';

/** Characters a cell can hold (Excel's specifications and limits: 32,767). */
export const cellTextLimit = 32_767;

/** Rows between two looks at how much written XML still waits for the zip. */
const rowsPerPause = 500;
/** XML waiting for the zip beyond which writing waits for it to be taken (bytes). */
const backlogLimit = 4 * 1024 * 1024;

/**
 * Lets the zip take what this sheet wrote. exceljs's sheet stream does not wait for its reader: archiver
 * reads it through a PassThrough it pipes it into (archiver-utils normalizeInputSource), and rows written
 * faster than deflate compresses them pile up there — a 200,000-row sheet whole in memory. That PassThrough
 * (readable-stream 2.x: `_writableState.length` bytes waiting) is the sheet stream's one pipe: beyond
 * `backlogLimit`, wait until it has drained; otherwise one turn of the event loop, so deflate is fed as
 * rows are written. Should a later exceljs keep it elsewhere, only the turn remains.
 */
async function zipCaughtUp(ws: ExcelJS.Worksheet): Promise<void> {
  type Pipe = EventEmitter & { writableLength?: number; _writableState?: { length?: number } };
  const pipe = (ws as unknown as { stream?: { pipes?: unknown[] } }).stream?.pipes?.[0];
  const waiting = pipe instanceof EventEmitter ? ((pipe as Pipe).writableLength ?? (pipe as Pipe)._writableState?.length ?? 0) : 0;
  if (waiting > backlogLimit) await once(pipe as EventEmitter, 'drain');
  else await new Promise<void>((resolve) => setImmediate(resolve));
}

/** One sheet being written: a header row (frozen, filtered), then rows in order. */
export class Sheet {
  private rowCount = 0;
  private sinceSlice = 0;
  private filterTo = 0;
  private readonly kinds: readonly CellKind[];

  constructor(
    private readonly ws: ExcelJS.Worksheet,
    readonly name: string,
    readonly columns: readonly ColumnSpec[],
    private readonly clock: SiteClock,
    private readonly filtered: boolean,
  ) {
    this.kinds = columns.map((c) => c.kind);
  }

  /** Number of the last row written (0 before the header). */
  get lastRow(): number {
    return this.rowCount;
  }

  /** Number the next row written will have. */
  get nextRow(): number {
    return this.rowCount + 1;
  }

  private cell(value: CellInput, kind: CellKind): ExcelJS.CellValue {
    if (value === null || value === undefined) return null;
    if (value instanceof Formula) return value.result === null ? { formula: value.expression } : { formula: value.expression, result: value.result };
    // Text stays text: exceljs writes a string as a string cell, whatever its first character. A cell holds
    // at most 32,767 characters (Excel's specifications and limits); a longer imported line is cut there.
    if (typeof value === 'string') return value.length > cellTextLimit ? `${value.slice(0, cellTextLimit - 1)}…` : value;
    if (typeof value === 'boolean') return value ? 'yes' : 'no';
    if (typeof value === 'number') return Number.isFinite(value) ? value : null;
    return kind === 'date' || kind === 'datetime' ? this.clock.wall(value) : value.toISOString();
  }

  // Per row: plain loops, no closures (a big sheet calls this 200,000 times).
  private write(values: readonly CellInput[], role: RowRole, kinds?: readonly (CellKind | undefined)[]): number {
    const cells: ExcelJS.CellValue[] = new Array(values.length);
    for (let i = 0; i < values.length; i++) cells[i] = this.cell(values[i], kinds?.[i] ?? this.kinds[i] ?? 'text');
    const row = this.ws.addRow(cells);
    if (kinds) {
      for (let i = 0; i < kinds.length; i++) {
        const kind = kinds[i];
        if (kind) row.getCell(i + 1).numFmt = numberFormats[kind];
      }
    }
    if (role === 'total') row.font = totalFont;
    else if (role === 'note') row.font = noteFont;
    else if (role === 'heading') row.font = headingFont;
    row.commit();
    this.rowCount += 1;
    if (role === 'data') this.filterTo = this.rowCount;
    return this.rowCount;
  }

  /** The header row: the columns' headers, bold, wrapped; frozen and filtered from the sheet's options. */
  header(): number {
    const row = this.ws.addRow(this.columns.map((c) => c.header));
    row.eachCell((cell) => (cell.style = headerStyle));
    row.height = 32;
    row.commit();
    this.rowCount += 1;
    return this.rowCount;
  }

  /** A title line in bold (key-value sheets start with one). */
  title(text: string): number {
    const row = this.ws.addRow([text]);
    row.getCell(1).font = titleFont;
    row.commit();
    this.rowCount += 1;
    return this.rowCount;
  }

  /**
   * One row of the table; returns its number. `kinds` overrides the columns' number formats cell by cell
   * (a rate under a money column). Pauses now and then so the zip can take what was written.
   */
  async row(values: readonly CellInput[], role: RowRole = 'data', kinds?: readonly (CellKind | undefined)[]): Promise<number> {
    const n = this.write(values, role, kinds);
    if (++this.sinceSlice >= rowsPerPause) {
      this.sinceSlice = 0;
      await zipCaughtUp(this.ws);
    }
    return n;
  }

  /** An empty row. */
  blank(): number {
    return this.write([], 'note');
  }

  /** A sentence under the table, in column A (it runs on over the empty cells beside it). */
  note(text: string): number {
    return this.write([text], 'note');
  }

  /** Sentences under the table, each on its own row; nothing when there are none. */
  notes(title: string, texts: readonly string[]): void {
    if (texts.length === 0) return;
    this.blank();
    this.write([title], 'heading');
    for (const t of texts) this.note(t);
  }

  /** Ends the sheet: the auto-filter over the header and the data rows, then the sheet goes to the zip. */
  commit(): { name: string; rows: number } {
    if (this.filtered && this.columns.length > 0) {
      const last = Math.max(this.filterTo, 1);
      this.ws.autoFilter = `A1:${columnLetter(this.columns.length)}${last}`;
    }
    this.ws.commit();
    return { name: this.name, rows: this.rowCount };
  }
}

/** What a sheet is: a table (header frozen and filtered) or a list of items and values (no filter). */
export interface SheetOptions {
  columns: readonly ColumnSpec[];
  /** A table: the first row is its header, frozen and filtered. Otherwise rows are free (a cover, definitions). */
  table: boolean;
}

/** Excel's limit on a sheet's name. */
const sheetNameLength = 31;

/** A workbook being written to a stream, sheet by sheet. */
export class Book {
  readonly sheets: { name: string; rows: number }[] = [];

  private constructor(
    private readonly wb: ExcelJS.stream.xlsx.WorkbookWriter,
    readonly clock: SiteClock,
  ) {}

  /**
   * Opens a workbook on `out`. exceljs is loaded on first use: it takes a few tenths of a second, which
   * a server that never writes a workbook need not pay at start.
   */
  static async open(out: Writable, timeZone: string, created: Date): Promise<Book> {
    const { default: Excel } = await import('exceljs');
    // Strings inline in their cells (t="str", no <f>), not in a shared-string table: the table is kept in
    // memory until the end, and a register with a unique serial per row would hold 200,000 of them.
    const wb = new Excel.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
    wb.creator = 'Osmia';
    wb.created = created;
    wb.modified = created;
    return new Book(wb, new SiteClock(timeZone));
  }

  /** Starts a sheet; a table gets its header row written, frozen below it and an auto-filter. */
  sheet(name: string, options: SheetOptions): Sheet {
    if (name.length > sheetNameLength || /[\\/?*[\]:]/.test(name)) throw new Error(`sheet name "${name}" is not valid in a workbook`);
    const ws = this.wb.addWorksheet(name, {
      views: options.table ? [{ state: 'frozen', ySplit: 1, xSplit: 0, topLeftCell: 'A2', activeCell: 'A2' }] : [],
    });
    ws.columns = options.columns.map((c) => ({ width: c.width, style: { numFmt: numberFormats[c.kind] } }));
    const sheet = new Sheet(ws, name, options.columns, this.clock, options.table);
    if (options.table) sheet.header();
    return sheet;
  }

  /** Records a committed sheet (its name and rows, for `--json` and the nightly mail). */
  done(sheet: Sheet): void {
    this.sheets.push(sheet.commit());
  }

  /** Writes what is left (styles, shared strings, the workbook part) and ends the stream. */
  async close(): Promise<{ name: string; rows: number }[]> {
    await this.wb.commit();
    return this.sheets;
  }
}
