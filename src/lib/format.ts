// Display formatting in the reader's locale. Values stay in their API units; only the text changes.

/**
 * The zone dates and times are shown in: the plant's own (set once its site is known, see
 * src/app/site-zone.ts), so a reader far from the plant sees a stop at 06:00 when the plant's clock said
 * 06:00, as the imports and KPI windows read it (docs/design.md §5, §6). Undefined: the browser's zone.
 */
let displayZone: string | undefined;
let dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
let dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

/** Show dates and times in `timeZone` (an IANA name); an unknown name keeps the browser's zone. */
export function setDisplayTimeZone(timeZone: string | undefined): void {
  try {
    dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short', timeZone });
    dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone });
    displayZone = timeZone;
  } catch {
    // RangeError for a zone this browser does not know: stay as we were.
  }
}

/** The zone set by setDisplayTimeZone, if any. */
export function displayTimeZone(): string | undefined {
  return displayZone;
}

/** An ISO 8601 instant as local date and time; null and unparsable values read "—". */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateTime.format(date);
}

/**
 * A constant to read, not to compute with: `digits` significant digits, and no decimals once the
 * integer part has that many (0.000689475729 → "0.0006895", 3020 → "3,020", 0.85 → "0.85").
 */
export function formatSignificant(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (Math.abs(value) >= 10 ** digits) return formatNumber(value, 0);
  return new Intl.NumberFormat(undefined, { maximumSignificantDigits: digits }).format(value);
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

/** An ISO 8601 instant as a local calendar date ("3 Mar 2026"); null and unparsable values read "—". */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateOnly.format(date);
}

/** A value and its unit ("259.2 h"); null reads "—". */
function withUnit(value: number | null | undefined, unit: string, maxDigits: number): string {
  const text = formatNumber(value, maxDigits);
  return text === '—' ? text : `${text} ${unit}`;
}

/** Hours, in the API's unit: "259.2 h". */
export function formatHours(hours: number | null | undefined, maxDigits = 1): string {
  return withUnit(hours, 'h', maxDigits);
}

/** Days, in the API's unit: "1,297 d". */
export function formatDays(days: number | null | undefined, maxDigits = 0): string {
  return withUnit(days, 'd', maxDigits);
}

/** A volume in cubic metres: "24,525 m³". */
export function formatVolume(m3: number | null | undefined, maxDigits = 0): string {
  return withUnit(m3, 'm³', maxDigits);
}

/**
 * An amount in the plant's currency (settings.currency). An ISO 4217 code gets the locale's currency
 * format ("€20,846"); any other text the setting allows (1–8 characters) follows the number.
 */
export function formatMoney(value: number | null | undefined, currency: string, maxDigits = 0): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (/^[A-Z]{3}$/.test(currency)) {
    try {
      return new Intl.NumberFormat(undefined, { style: 'currency', currency, maximumFractionDigits: maxDigits, minimumFractionDigits: 0 }).format(value);
    } catch {
      // Not a code Intl knows: fall through to "number code".
    }
  }
  return `${formatNumber(value, maxDigits)} ${currency}`;
}

/** A fraction 0–1 as a percentage: 0.9717 → "97.2 %". */
export function formatShare(fraction: number | null | undefined, maxDigits = 1): string {
  return withUnit(fraction === null || fraction === undefined ? fraction : fraction * 100, '%', maxDigits);
}

/** A change already in percent, always signed: 5.25 → "+5.3 %", −10 → "−10 %". */
export function formatChangePct(pct: number | null | undefined, maxDigits = 1): string {
  if (pct === null || pct === undefined || !Number.isFinite(pct)) return '—';
  const text = formatNumber(Math.abs(pct), maxDigits);
  const sign = text === '0' ? '' : pct > 0 ? '+' : '−';
  return `${sign}${text} %`;
}

/** A duration given in hours, in minutes below one hour ("2 min"), else in hours ("1.25 h"). */
export function formatHoursOrMinutes(hours: number | null | undefined): string {
  if (hours === null || hours === undefined || !Number.isFinite(hours)) return '—';
  return Math.abs(hours) < 1 ? withUnit(hours * 60, 'min', 0) : formatHours(hours, 2);
}

/** A byte count in the units a person reads, decimal (SI) prefixes: 950 B, 24.1 kB, 3.2 MB. */
export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return '—';
  const units = ['B', 'kB', 'MB', 'GB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit++;
  }
  return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: unit === 0 ? 0 : 1 }).format(value)} ${units[unit]}`;
}
