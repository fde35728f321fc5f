// Timestamps in ISO 8601, read as instants: with an offset as given, without one as wall-clock time in
// a site's zone (docs/design.md §5, §6). The importers read every timestamp of a file with it, and a KPI
// window's bounds are read the same way (server/services/scope.ts), so both agree on what a date means.
import { tzOffset } from '@date-fns/tz';

export type Parsed<T> = { ok: true; value: T } | { ok: false; reason: string };
const fail = (reason: string): { ok: false; reason: string } => ({ ok: false, reason });

const withOffset = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?(Z|[+-]\d{2}(?::?\d{2})?)$/i;
const naive = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?)?$/;

/** Counts of daylight-saving corrections made while reading naive local times. */
export interface DstCounts {
  /** Local times that do not exist (clocks jumped forward): moved forward by the gap. */
  gapShifted: number;
  /** Local times that happen twice (clocks went back): resolved to one of the two instants. */
  repeatResolved: number;
}

/**
 * Reads ISO 8601 timestamps: with an offset (Z, +02:00, +0200) they are instants; without one they
 * are wall-clock times in `timeZone`. A wall time in a spring-forward gap is moved forward by the gap
 * (the instant a clock that missed the change would mean); a wall time in the repeated autumn hour is
 * the first occurrence unless that would go back in time from `after` (the previous instant of the
 * same series), in which case it is the second. Both are counted in `dst`.
 */
export class TimestampReader {
  private offsetCache = new Map<number, number>();
  readonly dst: DstCounts = { gapShifted: 0, repeatResolved: 0 };
  constructor(readonly timeZone: string) {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone });
    } catch {
      throw new Error(`unknown time zone "${timeZone}"`);
    }
  }

  /** Offset of the zone at an instant, in ms; cached by quarter hour (every zone's offsets are multiples of 15 min). */
  private offsetAt(ms: number): number {
    const key = Math.floor(ms / 900_000);
    let off = this.offsetCache.get(key);
    if (off === undefined) {
      off = tzOffset(this.timeZone, new Date(key * 900_000)) * 60_000;
      if (this.offsetCache.size > 50_000) this.offsetCache.clear();
      this.offsetCache.set(key, off);
    }
    return off;
  }

  read(text: string, after?: number): Parsed<number> {
    const s = text.trim();
    let m = withOffset.exec(s);
    if (m) {
      const ms = Date.parse(s.replace(' ', 'T').replace(/([+-]\d{2})(\d{2})$/, '$1:$2'));
      if (Number.isNaN(ms) || !validParts(m)) return fail(`"${text}" is not a valid date and time`);
      return { ok: true, value: ms };
    }
    m = naive.exec(s);
    if (!m) return fail(`"${text}" is not an ISO 8601 date-time (expected e.g. 2026-03-29T02:30:00+02:00 or 2026-03-29 02:30)`);
    if (!validParts(m)) return fail(`"${text}" is not a valid date and time`);
    const [, y, mo, d, h = '0', mi = '0', sec = '0', frac = '0'] = m;
    const wall = Date.UTC(+y, +mo - 1, +d, +h, +mi, +sec, Math.round(Number(`0.${frac}`) * 1000));
    const before = this.offsetAt(wall - 86_400_000 / 2);
    const later = this.offsetAt(wall + 86_400_000 / 2);
    const c1 = wall - before;
    const c2 = wall - later;
    const ok1 = this.offsetAt(c1) === before;
    const ok2 = this.offsetAt(c2) === later;
    if (ok1 && ok2 && c1 !== c2) {
      this.dst.repeatResolved++;
      const [first, second] = c1 < c2 ? [c1, c2] : [c2, c1];
      return { ok: true, value: after !== undefined && first <= after ? second : first };
    }
    if (ok1) return { ok: true, value: c1 };
    if (ok2) return { ok: true, value: c2 };
    // In the gap: neither reading is consistent. Shift forward by the gap (later - before offsets).
    this.dst.gapShifted++;
    return { ok: true, value: wall - before };
  }
}

function validParts(m: RegExpExecArray): boolean {
  const [, y, mo, d, h = '0', mi = '0', s = '0'] = m;
  const date = new Date(Date.UTC(+y, +mo - 1, +d));
  return date.getUTCMonth() === +mo - 1 && date.getUTCDate() === +d && +h < 24 && +mi < 60 && +s < 61;
}
