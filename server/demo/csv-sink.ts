import { createHash, type Hash } from 'node:crypto';
import { once } from 'node:events';
import { createWriteStream, type WriteStream } from 'node:fs';
import { finished } from 'node:stream/promises';

export interface WrittenFile {
  rows: number;
  bytes: number;
  sha256: string;
}

/** Rows are gathered into buffers of this many bytes before they go to the stream. */
const chunkBytes = 1 << 20;

/** Quote a CSV field when it holds a comma, quote or line break (RFC 4180). */
export function csvField(value: string | number | null): string {
  if (value === null) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/**
 * A streaming CSV writer: text is encoded straight into 1 MB buffers that are hashed and handed
 * to the stream with backpressure, so no file is ever held in memory and no giant string is built.
 */
export class CsvSink {
  private buffer = Buffer.allocUnsafe(chunkBytes);
  private used = 0;
  private pendingBuffers: Buffer[] = [];
  private rowCount = 0;
  private byteCount = 0;
  private readonly hash: Hash = createHash('sha256');
  /** A write error (disk full, folder gone) is kept and thrown by the next flush or close. */
  private failure: Error | null = null;

  private constructor(private readonly stream: WriteStream) {
    stream.on('error', (error) => {
      this.failure ??= error;
    });
  }

  static open(path: string, header: readonly string[]): CsvSink {
    const sink = new CsvSink(createWriteStream(path));
    sink.appendLines(`${header.join(',')}\n`, 0);
    return sink;
  }

  /** Append text already split into '\n'-terminated lines; `rows` says how many. Call flushIfFull after. */
  appendLines(text: string, rows: number): void {
    this.rowCount += rows;
    // UTF-8 takes at most 3 bytes per UTF-16 code unit.
    if (this.used + text.length * 3 > this.buffer.length) {
      this.handOver();
      if (text.length * 3 > this.buffer.length) {
        this.pendingBuffers.push(Buffer.from(text, 'utf8'));
        return;
      }
    }
    this.used += this.buffer.write(text, this.used, 'utf8');
  }

  /** Move the filled part of the buffer to the queue of buffers waiting for the stream. */
  private handOver(): void {
    if (this.used === 0) return;
    this.pendingBuffers.push(this.buffer.subarray(0, this.used));
    this.buffer = Buffer.allocUnsafe(chunkBytes);
    this.used = 0;
  }

  async flushIfFull(): Promise<void> {
    if (this.pendingBuffers.length > 0) await this.flush(false);
  }

  async writeRow(fields: readonly (string | number | null)[]): Promise<void> {
    this.appendLines(`${fields.map(csvField).join(',')}\n`, 1);
    await this.flushIfFull();
  }

  private async flush(all: boolean): Promise<void> {
    if (all) this.handOver();
    const buffers = this.pendingBuffers;
    this.pendingBuffers = [];
    for (const chunk of buffers) {
      if (this.failure) throw this.failure;
      this.hash.update(chunk);
      this.byteCount += chunk.length;
      if (!this.stream.write(chunk)) await once(this.stream, 'drain');
    }
  }

  async close(): Promise<WrittenFile> {
    await this.flush(true);
    if (this.failure) throw this.failure;
    this.stream.end();
    await finished(this.stream);
    return { rows: this.rowCount, bytes: this.byteCount, sha256: this.hash.digest('hex') };
  }

  /** Stop writing after a failure elsewhere; the partial file is left for the caller to remove. */
  destroy(): void {
    this.stream.destroy();
  }
}
