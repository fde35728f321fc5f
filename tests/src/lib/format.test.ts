// Display formatting of the pages (src/lib/format.ts): dates in the plant's zone once it is set, numbers
// with their units, "—" for what is missing. Expected strings come from Intl itself with the same options.
import { afterEach, describe, expect, it } from 'vitest';
import { formatBytes, formatDate, formatDateTime, formatHours, formatMoney, setDisplayTimeZone } from '#src/lib/format.ts';

afterEach(() => setDisplayTimeZone(undefined));

describe('dates', () => {
  it('reads an instant in the zone set for the site, not the machine’s', () => {
    const iso = '2026-03-01T03:30:00Z';
    setDisplayTimeZone('America/Denver');
    expect(formatDateTime(iso)).toBe(new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short', timeZone: 'America/Denver' }).format(new Date(iso)));
    // 03:30 UTC is still 28 February in Denver (UTC−7).
    expect(formatDate(iso)).toBe(new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'America/Denver' }).format(new Date('2026-02-28T12:00:00Z')));
    setDisplayTimeZone('Asia/Tokyo');
    expect(formatDate(iso)).toBe(new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'Asia/Tokyo' }).format(new Date(iso)));
  });

  it('keeps the zone it had when given one the runtime does not know', () => {
    setDisplayTimeZone('Asia/Tokyo');
    setDisplayTimeZone('Mars/Olympus');
    expect(formatDate('2026-03-01T20:00:00Z')).toBe(new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'Asia/Tokyo' }).format(new Date('2026-03-01T20:00:00Z')));
  });

  it('writes — for what is missing or unreadable', () => {
    expect(formatDate(null)).toBe('—');
    expect(formatDateTime('not a date')).toBe('—');
  });
});

describe('numbers with units', () => {
  it('keeps the unit beside the number and — for null', () => {
    expect(formatHours(259.24)).toBe(`${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(259.2)} h`);
    expect(formatHours(null)).toBe('—');
    expect(formatMoney(null, 'EUR')).toBe('—');
  });
});

describe('sizes', () => {
  it('writes bytes with decimal SI prefixes (1 kB = 1000 B, SI Brochure 9th ed. §3), one decimal above bytes', () => {
    const one = (n: number) => new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(n);
    expect(formatBytes(950)).toBe('950 B');
    expect(formatBytes(18_500)).toBe(`${one(18.5)} kB`);
    expect(formatBytes(3_210_000)).toBe(`${one(3.2)} MB`);
    expect(formatBytes(999_999)).toBe(`${one(1000)} kB`);
    expect(formatBytes(-1)).toBe('—');
    expect(formatBytes(Number.NaN)).toBe('—');
  });
});
