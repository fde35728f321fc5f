import { readFileSync } from 'node:fs';
import { z } from 'zod';

/** Renames of real export headers to canonical ones, compared case- and space-insensitively. */
export type ColumnMap = Map<string, string>;

const norm = (h: string) => h.trim().toLowerCase().replace(/\s+/g, ' ');
const mapJsonSchema = z.record(z.string(), z.string().min(1));

/**
 * A column map from JSON (`{"Their header": "our_header"}`) or lines `Their header=our_header`
 * (# comments allowed), as text.
 */
export function parseColumnMap(text: string): ColumnMap {
  const trimmed = text.trim();
  const map: ColumnMap = new Map();
  if (trimmed === '') return map;
  if (trimmed.startsWith('{')) {
    let json: unknown;
    try {
      json = JSON.parse(trimmed);
    } catch (err) {
      throw new Error(`column map is not valid JSON: ${(err as Error).message}`, { cause: err });
    }
    const parsed = mapJsonSchema.safeParse(json);
    if (!parsed.success) throw new Error('column map JSON must be an object of header → header strings');
    for (const [from, to] of Object.entries(parsed.data)) map.set(norm(from), norm(to));
    return map;
  }
  trimmed.split(/\r?\n/).forEach((line, i) => {
    const l = line.trim();
    if (l === '' || l.startsWith('#')) return;
    const eq = l.lastIndexOf('=');
    if (eq <= 0 || eq === l.length - 1) throw new Error(`column map line ${i + 1}: expected "their header=our_header", got "${l}"`);
    map.set(norm(l.slice(0, eq)), norm(l.slice(eq + 1)));
  });
  return map;
}

export function readColumnMap(path: string): ColumnMap {
  return parseColumnMap(readFileSync(path, 'utf8'));
}

/** Canonical names of a header row after the map. */
export function applyColumnMap(header: string[], map: ColumnMap | undefined): string[] {
  return header.map((h) => {
    const n = norm(h.replace(/^\uFEFF/, ''));
    return map?.get(n) ?? n;
  });
}
