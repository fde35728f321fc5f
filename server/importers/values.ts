// Parsing of cell values shared by every importer: numbers, booleans, qualities (timestamps: shared/timestamps.ts).
import type { Parsed } from '#shared/timestamps.ts';

const fail = (reason: string): { ok: false; reason: string } => ({ ok: false, reason });

/** A number; with `decimalComma` (semicolon-delimited files) "12,5" reads as 12.5. */
export function readNumber(text: string, decimalComma = false): Parsed<number> {
  const s = decimalComma ? text.trim().replace(',', '.') : text.trim();
  if (s === '') return fail('empty value where a number is required');
  const n = Number(s);
  if (!Number.isFinite(n) || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return fail(`"${text}" is not a number`);
  return { ok: true, value: n };
}

const truthy = new Set(['1', 'true', 'yes', 'y', 'running', 'run', 'on']);
const falsy = new Set(['0', 'false', 'no', 'n', 'stopped', 'stop', 'off']);

export function readBoolean(text: string): Parsed<boolean> {
  const s = text.trim().toLowerCase();
  if (truthy.has(s)) return { ok: true, value: true };
  if (falsy.has(s)) return { ok: true, value: false };
  return fail(`"${text}" is not yes/no, true/false, 1/0 or running/stopped`);
}

/** OPC DA quality byte classes (bits 7–6): 11 good, 01 uncertain, 00 bad; 10 is not used. */
export const qualityGood = 192;
export const qualityUncertain = 64;
export const qualityBad = 0;

/** `good|uncertain|bad` or an OPC DA numeric quality byte (0–255); empty means good. Stored as the byte. */
export function readQuality(text: string): Parsed<number> {
  const s = text.trim().toLowerCase();
  if (s === '' || s === 'good') return { ok: true, value: qualityGood };
  if (s === 'uncertain') return { ok: true, value: qualityUncertain };
  if (s === 'bad') return { ok: true, value: qualityBad };
  if (/^\d{1,3}$/.test(s) || /^0x[0-9a-f]{1,2}$/.test(s)) {
    const n = Number(s);
    if (n > 255) return fail(`quality ${text} is not an OPC DA quality byte (0–255)`);
    const cls = n & 0xc0;
    if (cls === 0x80) return fail(`quality ${text} has the unused OPC DA class 10 (bits 7–6)`);
    return { ok: true, value: n };
  }
  return fail(`unknown quality "${text}" (expected good, uncertain, bad or an OPC DA quality byte)`);
}

export const isGoodQuality = (q: number) => (q & 0xc0) === 0xc0;
