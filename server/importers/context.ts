import type pg from 'pg';
import type { Reject } from '#shared/schemas/imports.ts';
import type { SiteRow } from '../db/queries/sites.ts';
import type { Source } from './source.ts';
import type { TimestampReader } from '#shared/timestamps.ts';

/** Most rejects kept per import; the count stays exact beyond it. */
export const maxStoredRejects = 100_000;

/** What one kind's importer gets: a transaction, the site, the rows and somewhere to put rejects. */
export interface KindContext {
  client: pg.PoolClient;
  /** The import record's id; null in a dry run (nothing is kept). */
  importId: number | null;
  site: SiteRow;
  source: Source;
  /** Canonical column names of the header, after the column map. */
  columns: string[];
  time: TimestampReader;
  /** Semicolon-delimited files commonly write decimals with a comma. */
  decimalComma: boolean;
  rejects: RejectSink;
  notes: Record<string, unknown>;
  progress: (rowsRead: number) => void;
}

export interface KindResult {
  rowsRead: number;
  rowsInserted: number;
  rowsUpdated: number;
  rowsUnchanged: number;
}

/** A text column cannot hold a NUL byte: a reject quoting one keeps U+FFFD in its place. */
const storable = (s: string) => (s.includes('\u0000') ? s.replaceAll('\u0000', '\uFFFD') : s);

export class RejectSink {
  readonly kept: (Reject & { raw?: string })[] = [];
  count = 0;
  add(line: number, reason: string, raw?: string[]) {
    this.count++;
    if (this.kept.length < maxStoredRejects) {
      const text = raw?.join(',').slice(0, 2000);
      this.kept.push({ line, reason: storable(reason), raw: text === undefined ? undefined : storable(text) });
    }
  }
}

/** Index of each canonical column in the header (-1 when absent). */
export function columnIndex<T extends string>(columns: string[], names: readonly T[]): Record<T, number> {
  return Object.fromEntries(names.map((n) => [n, columns.indexOf(n)])) as Record<T, number>;
}

/** The cells of a row as an object of canonical columns; absent columns read as ''. */
export function rowObject<T extends string>(cells: string[], index: Record<T, number>): Record<T, string> {
  const out = {} as Record<T, string>;
  for (const key in index) {
    const i = index[key];
    out[key] = i >= 0 ? (cells[i] ?? '').trim() : '';
  }
  return out;
}
