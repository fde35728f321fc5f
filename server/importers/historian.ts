// Historian exports (long `timestamp,tag,value[,quality]` or wide `timestamp,<tag>,<tag>…`) into
// samples, streamed with COPY in constant memory. Rows are checked by hand here rather than with a
// zod row schema: this loop runs tens of millions of times and a schema per row would triple its cost.
import type { Writable } from 'node:stream';
import { from as copyFrom } from 'pg-copy-streams';
import { unitFor } from '#shared/units.ts';
import { listTags } from '../db/queries/tags.ts';
import {
  currentXid,
  deleteRepeatedSamples,
  insertCoverage,
  markDirtyHours,
  tagsWithOverlap,
  writeImportRollups,
  type TagSpan,
} from '../db/queries/samples.ts';
import type { KindContext, KindResult } from './context.ts';
import { ImportFileError } from './errors.ts';
import { maxFieldLength } from './source.ts';
import { readBoolean, readQuality } from './values.ts';

interface TagInfo {
  id: number;
  name: string;
  isStatus: boolean;
  /** The export's unit is the canonical one: no conversion. */
  identity: boolean;
  convert: (v: number) => number;
  /** This file's span of the tag, filled while reading. */
  span?: Span;
  /** The hour of good samples being summed for the rollups (see HourlyRollups); -1 before the first. */
  hour: number;
  n: number;
  sum: number;
  min: number;
  max: number;
  last: number;
}

const HOUR_MS = 3_600_000;

/**
 * Hourly rollups of good samples (count, sum, min, max, last instant), summed while the file streams,
 * so an import need not leave them to a refresh that reads every sample again (that refresh took five
 * times as long as the import itself on 5 M rows). A tag's samples arrive mostly in time order: one open
 * hour per tag, closed into these columns when the hour changes; out-of-order samples just close more
 * partial hours, which the database adds up (`writeImportRollups`). Numbers only, no object per hour.
 */
class HourlyRollups {
  tagIds: number[] = [];
  hours: number[] = [];
  n: number[] = [];
  sums: number[] = [];
  mins: number[] = [];
  maxs: number[] = [];
  lasts: number[] = [];
  close(tag: TagInfo) {
    if (tag.n === 0) return;
    this.tagIds.push(tag.id);
    this.hours.push(tag.hour);
    this.n.push(tag.n);
    this.sums.push(tag.sum);
    this.mins.push(tag.min);
    this.maxs.push(tag.max);
    this.lasts.push(tag.last);
    tag.n = 0;
  }
  add(tag: TagInfo, tsMs: number, value: number) {
    const hour = tsMs - (((tsMs % HOUR_MS) + HOUR_MS) % HOUR_MS);
    if (hour !== tag.hour) {
      this.close(tag);
      tag.hour = hour;
      tag.sum = 0;
      tag.min = Infinity;
      tag.max = -Infinity;
      tag.last = -Infinity;
    }
    tag.n++;
    tag.sum += value;
    if (value < tag.min) tag.min = value;
    if (value > tag.max) tag.max = value;
    if (tsMs > tag.last) tag.last = tsMs;
  }
}

interface Span {
  from: number;
  to: number;
  rows: number;
  last: number;
  ordered: boolean;
}

const numberPattern = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** 2000-01-01T00:00:00Z, PostgreSQL's timestamp epoch, in Unix milliseconds. */
const pgEpochMs = 946_684_800_000;
const chunkBytes = 256 * 1024;
/** Bytes of one tuple: field count, then (length, data) for int4, timestamptz, float8, int2. */
const tupleBytes = 2 + 4 + 4 + 4 + 8 + 4 + 8 + 4 + 2;

/**
 * Writes samples in PostgreSQL's binary COPY format, in chunks of about 256 kB, waiting when
 * PostgreSQL is behind. Binary rather than text: no string is built per sample and the server parses
 * no timestamp or number text, which made the import about a third faster (measured on 5 M rows).
 * Format: PostgreSQL documentation, "COPY — Binary Format".
 */
class BinaryCopyWriter {
  private buf = Buffer.allocUnsafe(chunkBytes + tupleBytes);
  private pos = 0;
  /** Full chunks waiting for the next flush (a batch can fill more than one). */
  private pending: Buffer[] = [];
  constructor(
    private readonly stream: Writable,
    private readonly failed: () => Error | undefined,
  ) {
    // Signature, flags (no OIDs), header extension length.
    this.pos += this.buf.write('PGCOPY\n\xff\r\n\0', 0, 'latin1');
    this.pos = this.buf.writeInt32BE(0, this.pos);
    this.pos = this.buf.writeInt32BE(0, this.pos);
  }
  row(tagId: number, tsMs: number, value: number, quality: number) {
    if (this.pos >= chunkBytes) {
      this.pending.push(this.buf.subarray(0, this.pos));
      this.buf = Buffer.allocUnsafe(chunkBytes + tupleBytes);
      this.pos = 0;
    }
    const b = this.buf;
    let p = this.pos;
    p = b.writeInt16BE(4, p);
    p = b.writeInt32BE(4, p);
    p = b.writeInt32BE(tagId, p);
    // timestamptz: int64 microseconds since 2000-01-01, written as two 32-bit halves (exact below 2^53).
    const micros = (tsMs - pgEpochMs) * 1000;
    const high = Math.floor(micros / 4294967296);
    p = b.writeInt32BE(8, p);
    p = b.writeInt32BE(high, p);
    p = b.writeUInt32BE(micros - high * 4294967296, p);
    p = b.writeInt32BE(8, p);
    p = b.writeDoubleBE(value, p);
    p = b.writeInt32BE(2, p);
    this.pos = b.writeInt16BE(quality, p);
  }
  get full(): boolean {
    return this.pending.length > 0 || this.pos >= chunkBytes;
  }
  async flushIfFull(): Promise<void> {
    if (this.full) await this.flush();
  }
  async flush(): Promise<void> {
    const err = this.failed();
    if (err) throw err;
    if (this.pos > 0) {
      this.pending.push(this.buf.subarray(0, this.pos));
      this.buf = Buffer.allocUnsafe(chunkBytes + tupleBytes);
      this.pos = 0;
    }
    if (this.pending.length === 0) return;
    const chunk = this.pending.length === 1 ? this.pending[0] : Buffer.concat(this.pending);
    this.pending = [];
    if (!this.stream.write(chunk)) await new Promise<void>((resolve, reject) => {
      const onDrain = () => (this.stream.off('error', onError), resolve());
      const onError = (err: Error) => (this.stream.off('drain', onDrain), reject(err));
      this.stream.once('drain', onDrain);
      this.stream.once('error', onError);
    });
  }
  async end(): Promise<void> {
    if (this.pos >= chunkBytes) await this.flush();
    this.pos = this.buf.writeInt16BE(-1, this.pos); // file trailer
    await this.flush();
    const err = this.failed();
    if (err) throw err;
    return new Promise((resolve, reject) => {
      this.stream.once('finish', resolve);
      this.stream.once('error', reject);
      this.stream.end();
    });
  }
}

export async function importHistorian(ctx: KindContext): Promise<KindResult> {
  const { client, site, columns, source, rejects, time, decimalComma } = ctx;
  // One historian import per site at a time, so overlap checks see every earlier sample.
  await client.query('select pg_advisory_xact_lock(3, $1)', [site.id]);

  const tags = new Map<string, TagInfo>();
  for (const t of await listTags(client, site.id)) {
    const unit = unitFor(t.quantity, t.sourceUnit);
    if (!unit.ok) throw new ImportFileError(`Tag ${t.name} has an unusable unit: ${unit.reason}`);
    const identity = unit.convert(1) === 1 && unit.convert(0) === 0;
    tags.set(t.name.toLowerCase(), { id: t.id, name: t.name, isStatus: t.quantity === 'run_status', identity, convert: unit.convert, hour: -1, n: 0, sum: 0, min: 0, max: 0, last: 0 });
  }
  if (tags.size === 0) throw new ImportFileError(`Site ${site.code} has no tags: import the tag map first (osmia import tags …).`);

  const long = columns.includes('tag') && columns.includes('value');
  const iTime = 0;
  const iTag = columns.indexOf('tag');
  const iValue = columns.indexOf('value');
  const iQuality = columns.indexOf('quality');
  let wideTags: (TagInfo | undefined)[] = [];
  if (!long) {
    wideTags = source.header.map((h, i) => (i === 0 ? undefined : tags.get(h.trim().toLowerCase())));
    const unknown = source.header.slice(1).filter((_, i) => !wideTags[i + 1]);
    if (unknown.length > 0) {
      throw new ImportFileError(
        `Unknown tag column${unknown.length > 1 ? 's' : ''}: ${unknown.slice(0, 20).join(', ')}${unknown.length > 20 ? ' …' : ''}. ` +
          'Import them in the tag map first, or rename the columns with --map.',
      );
    }
  }
  ctx.notes.layout = long ? 'long' : 'wide';

  const copy = client.query(copyFrom('copy samples (tag_id, ts, value, quality) from stdin with (format binary)'));
  // A lost connection errors the stream at any moment: keep it, and fail at the next write.
  let copyError: Error | undefined;
  copy.on('error', (err: Error) => (copyError ??= err));
  const writer = new BinaryCopyWriter(copy, () => copyError);
  const rollups = new HourlyRollups();
  const touched: TagInfo[] = [];
  let rowsRead = 0;
  let samples = 0;
  let lastTimeText = '';
  let lastTimeMs = 0;
  let lastInstant: number | undefined;
  let lastQualityText = 'good';
  let lastQuality = 192;
  let badQualities = 0;

  const readTime = (text: string): boolean => {
    if (text === lastTimeText) return true;
    const parsed = time.read(text, lastInstant);
    if (!parsed.ok) return false;
    lastTimeText = text;
    lastTimeMs = parsed.value;
    lastInstant = parsed.value;
    return true;
  };

  // The value in the canonical unit, or NaN with the reason in `rejectReason` (no object per row: this
  // runs for every sample). Number() is the parser; the pattern only screens the radix prefixes
  // (0x…, 0b…, 0o…) Number() accepts and a historian value never means.
  let rejectReason = '';
  const valueOf = (tag: TagInfo, raw: string): number => {
    if (tag.isStatus) {
      const b = readBoolean(raw);
      if (b.ok) return b.value ? 1 : 0;
      rejectReason = `run status ${b.reason}`;
      return NaN;
    }
    let s = raw.trim();
    if (decimalComma) s = s.replace(',', '.');
    if (s.length === 0) {
      rejectReason = 'empty value';
      return NaN;
    }
    const v = Number(s);
    const c1 = s.length > 1 ? s.charCodeAt(1) | 0x20 : 0;
    if (!Number.isFinite(v) || ((c1 === 0x78 || c1 === 0x62 || c1 === 0x6f) && !numberPattern.test(s))) {
      rejectReason = `value "${raw}" is not a number`;
      return NaN;
    }
    return tag.identity ? v : tag.convert(v);
  };

  const record = (tag: TagInfo, value: number, quality: number) => {
    writer.row(tag.id, lastTimeMs, value, quality);
    samples++;
    if ((quality & 0xc0) === 0xc0) rollups.add(tag, lastTimeMs, value);
    let span = tag.span;
    if (!span) {
      span = tag.span = { from: lastTimeMs, to: lastTimeMs, rows: 0, last: -Infinity, ordered: true };
      touched.push(tag);
    }
    if (lastTimeMs <= span.last) span.ordered = false;
    span.last = lastTimeMs;
    if (lastTimeMs < span.from) span.from = lastTimeMs;
    if (lastTimeMs > span.to) span.to = lastTimeMs;
    span.rows++;
  };

  try {
    for await (const batch of source.batches) {
      for (const { line, cells } of batch) {
        rowsRead++;
        if (!readTime(cells[iTime] ?? '')) {
          const parsed = time.read(cells[iTime] ?? '');
          rejects.add(line, parsed.ok ? 'bad timestamp' : parsed.reason, cells);
          continue;
        }
        if (long) {
          if (cells.length < 3 || (iQuality >= 0 && cells.length < columns.length)) {
            rejects.add(line, `expected ${columns.length} columns, found ${cells.length}`, cells);
            continue;
          }
          if (cells.length > columns.length) {
            rejects.add(line, `expected ${columns.length} columns, found ${cells.length} (a delimiter inside an unquoted value?)`, cells);
            continue;
          }
          if (cells[iValue].length > maxFieldLength || cells[iTag].length > maxFieldLength) {
            rejects.add(line, `a field is longer than ${maxFieldLength} characters (unterminated quote?)`);
            continue;
          }
          const tag = tags.get((cells[iTag] ?? '').trim().toLowerCase());
          if (!tag) {
            rejects.add(line, `unknown tag "${cells[iTag]}" (not in the tag map of site ${site.code})`, cells);
            continue;
          }
          const value = valueOf(tag, cells[iValue] ?? '');
          if (Number.isNaN(value)) {
            rejects.add(line, rejectReason, cells);
            continue;
          }
          let quality = lastQuality;
          if (iQuality >= 0 && cells[iQuality] !== lastQualityText) {
            const q = readQuality(cells[iQuality]);
            if (!q.ok) {
              rejects.add(line, q.reason, cells);
              continue;
            }
            lastQualityText = cells[iQuality];
            lastQuality = quality = q.value;
          }
          if ((quality & 0xc0) !== 0xc0) badQualities++;
          record(tag, value, quality);
        } else {
          if (cells.length !== columns.length) {
            rejects.add(line, `expected ${columns.length} columns, found ${cells.length}`, cells);
            continue;
          }
          const problems: string[] = [];
          const good: [TagInfo, number][] = [];
          for (let i = 1; i < cells.length; i++) {
            if (cells[i].trim() === '') continue; // no sample of this tag at this time
            const tag = wideTags[i]!;
            const value = valueOf(tag, cells[i]);
            if (Number.isNaN(value)) problems.push(`${tag.name}: ${rejectReason}`);
            else good.push([tag, value]);
          }
          if (problems.length > 0) {
            rejects.add(line, problems.join('; '), cells);
            continue;
          }
          for (const [tag, value] of good) record(tag, value, 192);
        }
      }
      ctx.progress(rowsRead);
      await writer.flushIfFull();
    }
    await writer.flush();
    await writer.end();
  } catch (err) {
    copy.destroy(err as Error);
    throw err;
  }

  const tagSpans: TagSpan[] = touched.map(({ id, span }) => ({ tagId: id, from: new Date(span!.from), to: new Date(span!.to), rows: span!.rows }));
  const ordered = new Map(touched.map((t) => [t.id, t.span!.ordered]));
  // Duplicates are possible only where a tag's span overlaps an earlier import or the file repeats itself.
  const overlapping = new Set(await tagsWithOverlap(client, tagSpans));
  const suspects = tagSpans.filter((s) => overlapping.has(s.tagId) || !ordered.get(s.tagId));
  const removed = await deleteRepeatedSamples(client, await currentXid(client), suspects);
  let unchanged = 0;
  for (const span of tagSpans) {
    const n = removed.get(span.tagId) ?? 0;
    span.rows -= n;
    unchanged += n;
  }
  if (ctx.importId !== null) await insertCoverage(client, ctx.importId, tagSpans);
  // Rollups: a tag whose samples cannot repeat earlier ones (no overlap with an earlier import, in time
  // order) gets the hourly rows summed while reading, merged into any row an earlier import left at the
  // edge hours. The others — repeats were removed after the COPY, so the sums would be off — and the
  // run-status tags (whose stop events refresh derives) are queued for refresh as before.
  for (const tag of touched) rollups.close(tag);
  const suspectIds = new Set(suspects.map((x) => x.tagId));
  const summed = new Set(touched.filter((t) => !suspectIds.has(t.id)).map((t) => t.id));
  await writeImportRollups(client, rollups, summed);
  await markDirtyHours(
    client,
    tagSpans.filter((x) => !summed.has(x.tagId) || touched.find((t) => t.id === x.tagId)!.isStatus),
  );
  ctx.notes.samplesRead = samples;
  ctx.notes.tags = tagSpans.length;
  if (badQualities) ctx.notes.samplesNotGoodQuality = badQualities;
  if (tagSpans.length) {
    ctx.notes.from = new Date(Math.min(...tagSpans.map((s) => s.from.getTime()))).toISOString();
    ctx.notes.to = new Date(Math.max(...tagSpans.map((s) => s.to.getTime()))).toISOString();
  }
  return { rowsRead, rowsInserted: samples - unchanged, rowsUpdated: 0, rowsUnchanged: unchanged };
}
