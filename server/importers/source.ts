// Reading an import file as batches of rows with their physical line numbers, whatever it is:
// CSV (UTF-8, with or without BOM, comma or semicolon, quoted fields) or XLSX (first sheet).
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { PassThrough, Transform } from 'node:stream';
import type ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { ImportFileError } from './errors.ts';

export interface RawRow {
  /** Physical line of the file where the row starts (the header is line 1); the sheet row in XLSX. */
  line: number;
  cells: string[];
}

export interface Source {
  format: 'csv' | 'xlsx';
  delimiter: ',' | ';' | '\t' | null;
  header: string[];
  /** Rows after the header, in batches (a batch is what one parser chunk yields). */
  batches: AsyncGenerator<RawRow[]>;
  /** Bytes read so far (for progress). */
  bytesRead: () => number;
  /** sha256 of the whole file, hashed as it was read; known once the batches are exhausted (CSV only). */
  sha256: () => string | null;
  /** Problems that made whole rows unreadable (unterminated quote…), by line. */
  parseErrors: { line: number; reason: string }[];
}

const maxFieldLength = 64 * 1024;

/**
 * Longest physical line a CSV may have. Papaparse re-reads the unfinished line with every 64 kB it
 * is given, so the cost of one long line grows with the square of its length (an 8 MB line took 2 s
 * of CPU, a 50 MB one about a minute and half a gigabyte) before the row was rejected. No export row
 * comes near 1 MiB (register cells hold at most 4,000 characters, historian cells 64 kB), so such a
 * file is refused as soon as a line passes the limit, after reading little more than that.
 */
export const maxLineBytes = 1 << 20;

/** Number of line breaks (LF, CRLF or a lone CR) in the first `end` bytes of a file: read only to name a refused line. */
async function lineBreaksBefore(path: string, end: number): Promise<number> {
  if (end <= 0) return 0;
  let n = 0;
  let lastWasCr = false;
  for await (const chunk of createReadStream(path, { end: end - 1 }) as AsyncIterable<Buffer>) {
    for (const b of chunk) {
      if (b === 0x0a && !lastWasCr) n++;
      else if (b === 0x0d) n++;
      lastWasCr = b === 0x0d;
    }
  }
  return n;
}

/** The first `bytes` bytes of a file (fewer when it is shorter); the file is closed at once. */
export async function peek(path: string, bytes: number): Promise<Buffer> {
  const fh = await open(path, 'r');
  try {
    const buf = Buffer.alloc(bytes);
    const { bytesRead } = await fh.read(buf, 0, bytes, 0);
    return buf.subarray(0, bytesRead);
  } finally {
    await fh.close();
  }
}

function looksBinary(head: Buffer): boolean {
  if (head.includes(0)) return true;
  const text = head.toString('utf8');
  const replacement = text.split('\uFFFD').length - 1;
  return replacement > 8 && replacement > text.length / 100;
}

/** The delimiter of the header line: the most frequent of , ; and tab outside quotes. */
export function detectDelimiter(headerLine: string): ',' | ';' | '\t' {
  const counts = { ',': 0, ';': 0, '\t': 0 };
  let quoted = false;
  for (const ch of headerLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch in counts) counts[ch as keyof typeof counts]++;
  }
  const best = (Object.entries(counts) as [',' | ';' | '\t', number][]).sort((a, b) => b[1] - a[1])[0];
  return best[1] === 0 ? ',' : best[0];
}

export async function openSource(path: string): Promise<Source> {
  const head = await peek(path, 64 * 1024);
  if (head.length === 0) throw new ImportFileError('The file is empty: expected a header line and rows.');
  if (head[0] === 0x50 && head[1] === 0x4b) return openXlsx(path);
  if (looksBinary(head)) throw new ImportFileError('The file is not text (binary content): expected a UTF-8 CSV or an XLSX workbook.');
  return openCsv(path, head);
}

async function openCsv(path: string, head: Buffer): Promise<Source> {
  const bom = head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf;
  const text = head.toString('utf8', bom ? 3 : 0);
  const firstLine = text.split(/\r?\n/, 1)[0] ?? '';
  if (firstLine.trim() === '') throw new ImportFileError('The first line is empty: expected a header line.');
  const delimiter = detectDelimiter(firstLine);
  let bytes = 0;
  let sawQuote = false;
  // The file's sha256 is taken on the way through, so a new file is read once, not twice.
  const hash = createHash('sha256');
  let digest: string | null = null;
  // Bytes since the last line break (LF or CR), across chunks: the length of the line being read.
  let lineBytes = 0;
  const counter = new Transform({
    transform(chunk: Buffer, _enc, done) {
      hash.update(chunk);
      const text = bytes === 0 && bom ? chunk.subarray(3) : chunk;
      const lf = chunk.indexOf(0x0a);
      const cr = chunk.indexOf(0x0d);
      const first = lf === -1 ? cr : cr === -1 ? lf : Math.min(lf, cr);
      if (lineBytes + (first === -1 ? chunk.length : first) > maxLineBytes) {
        // A line within one chunk cannot pass the limit (chunks are 64 kB): only the one running on from before can.
        const lineStart = bytes - lineBytes;
        input.destroy();
        lineBreaksBefore(path, lineStart).then(
          (breaks) => done(new ImportFileError(`Line ${breaks + 1} is longer than 1 MiB (${maxLineBytes.toLocaleString('en-US')} bytes): this is not a file of rows; nothing was imported.`)),
          (err: Error) => done(err),
        );
        return;
      }
      lineBytes = first === -1 ? lineBytes + chunk.length : chunk.length - 1 - Math.max(chunk.lastIndexOf(0x0a), chunk.lastIndexOf(0x0d));
      bytes += chunk.length;
      if (!sawQuote && text.includes(0x22)) sawQuote = true;
      done(null, text);
    },
    flush(done) {
      digest = hash.digest('hex');
      done();
    },
  });
  // Default 64 kB reads: papaparse slowed down threefold with 256 kB chunks and more with 1 MB (measured).
  const input = createReadStream(path);
  const text$ = input.pipe(counter).pipe(new PassThrough({ encoding: 'utf8' }));
  input.on('error', (err) => text$.destroy(err));
  counter.on('error', (err) => text$.destroy(err));

  const parseErrors: Source['parseErrors'] = [];
  const queue: string[][][] = [];
  let finished = false;
  let failure: Error | undefined;
  let wake: (() => void) | undefined;
  let paused: Papa.Parser | undefined;
  const notify = () => {
    wake?.();
    wake = undefined;
  };

  Papa.parse<string[]>(text$ as unknown as Papa.LocalFile, {
    delimiter,
    skipEmptyLines: false,
    chunk(results, parser) {
      queue.push(results.data);
      for (const e of results.errors) {
        if (e.code === 'MissingQuotes' || e.code === 'InvalidQuotes') {
          parseErrors.push({ line: -1 - (e.row ?? 0), reason: `unterminated or stray quote (${e.message})` });
        }
      }
      if (queue.length >= 4) {
        parser.pause();
        paused = parser;
      }
      notify();
    },
    complete() {
      finished = true;
      notify();
    },
    error(err: Error) {
      failure = err;
      finished = true;
      notify();
    },
  });

  async function* rawRows(): AsyncGenerator<string[][]> {
    for (;;) {
      if (queue.length > 0) {
        const rows = queue.shift()!;
        if (paused && queue.length < 2) {
          const p = paused;
          paused = undefined;
          p.resume();
        }
        yield rows;
        continue;
      }
      if (failure) throw failure instanceof ImportFileError ? failure : new ImportFileError(`The file could not be read: ${failure.message}`);
      if (finished) return;
      await new Promise<void>((r) => (wake = r));
    }
  }

  // Walk rows, keeping the physical line count: a row spans 1 + the newlines inside its quoted fields.
  const it = rawRows();
  let header: string[] | undefined;
  let line = 0;
  let pending: string[][] = [];
  while (!header) {
    const next = await it.next();
    if (next.done) break;
    pending = next.value;
    if (pending.length > 0) {
      header = pending[0];
      line = 1 + newlinesIn(header);
      pending = pending.slice(1);
    }
  }
  if (!header) throw new ImportFileError('The file is empty: expected a header line and rows.');

  async function* batches(): AsyncGenerator<RawRow[]> {
    let rowsSeen = 0;
    const convert = (rows: string[][]): RawRow[] => {
      const out: RawRow[] = [];
      for (const cells of rows) {
        const start = line + 1;
        line += 1 + (sawQuote ? newlinesIn(cells) : 0);
        rowsSeen++;
        // A blank line is a line, not a row.
        if (cells.length === 1 && cells[0] === '') continue;
        out.push({ line: start, cells });
      }
      return out;
    };
    if (pending.length) yield convert(pending);
    for await (const rows of it) yield convert(rows);
    // Papaparse numbers rows in a chunk; map its quote errors to the line they ended on.
    for (const e of parseErrors) if (e.line < 0) e.line = Math.max(2, line);
    void rowsSeen;
  }

  return { format: 'csv', delimiter, header, batches: batches(), bytesRead: () => bytes, sha256: () => digest, parseErrors };
}

function newlinesIn(cells: string[]): number {
  let n = 0;
  for (const c of cells) {
    if (c.length > 0 && c.indexOf('\n') !== -1) n += c.split('\n').length - 1;
  }
  return n;
}

/** A cell of exceljs as the text a CSV would have held. Dates in a sheet carry no zone: naive local time. */
function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return '';
  if (value instanceof Date) return value.toISOString().slice(0, 19);
  if (typeof value === 'object') {
    if ('result' in value) return cellText((value as ExcelJS.CellFormulaValue).result as ExcelJS.CellValue);
    if ('richText' in value) return value.richText.map((r) => r.text).join('');
    if ('text' in value) return String(value.text);
    if ('error' in value) return '';
    return '';
  }
  return String(value);
}

async function openXlsx(path: string): Promise<Source> {
  // exceljs takes ~0.4 s to load: only XLSX imports pay for it.
  const { default: Excel } = await import('exceljs');
  let bytes = 0;
  const input = createReadStream(path);
  input.on('data', (chunk) => (bytes += chunk.length));
  const reader = new Excel.stream.xlsx.WorkbookReader(input, {
    sharedStrings: 'cache',
    hyperlinks: 'ignore',
    styles: 'cache',
    worksheets: 'emit',
  });
  const toCells = (row: ExcelJS.Row) => {
    const values = (row.values as ExcelJS.CellValue[]).slice(1);
    return values.map(cellText);
  };

  async function* sheetRows(): AsyncGenerator<RawRow> {
    try {
      for await (const sheet of reader) {
        for await (const row of sheet as unknown as AsyncIterable<ExcelJS.Row>) yield { line: row.number, cells: toCells(row) };
        return; // first sheet only
      }
    } catch (err) {
      throw new ImportFileError(`The file is not a readable XLSX workbook: ${(err as Error).message}`);
    }
  }

  const rows = sheetRows();
  const first = await rows.next();
  if (first.done) throw new ImportFileError('The workbook’s first sheet is empty: expected a header row.');
  const header = first.value.cells;

  async function* batches(): AsyncGenerator<RawRow[]> {
    let batch: RawRow[] = [];
    for await (const r of rows) {
      if (r.cells.every((c) => c === '')) continue;
      batch.push(r);
      if (batch.length >= 2000) {
        yield batch;
        batch = [];
      }
    }
    if (batch.length) yield batch;
  }
  return { format: 'xlsx', delimiter: null, header, batches: batches(), bytesRead: () => bytes, sha256: () => null, parseErrors: [] };
}

export { maxFieldLength };
