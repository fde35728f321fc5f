// Display formatting in the reader's locale. Values stay in their API units; only the text changes.

const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** An ISO 8601 instant as local date and time; null and unparsable values read "—". */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateTime.format(date);
}

/** A number with up to `maxDigits` decimals, grouped in the reader's locale. */
export function formatNumber(value: number | null | undefined, maxDigits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return new Intl.NumberFormat(undefined, { maximumFractionDigits: maxDigits }).format(value);
}

/** Seconds as "3 d 4 h", "2 h 5 min" or "42 s": the two largest units. */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '—';
  const units: [string, number][] = [
    ['d', 86_400],
    ['h', 3_600],
    ['min', 60],
    ['s', 1],
  ];
  const parts: string[] = [];
  let rest = Math.floor(seconds);
  for (const [name, size] of units) {
    const n = Math.floor(rest / size);
    rest -= n * size;
    if (n > 0 || (parts.length === 0 && size === 1)) parts.push(`${n} ${name}`);
    if (parts.length === 2) break;
  }
  return parts.join(' ');
}
