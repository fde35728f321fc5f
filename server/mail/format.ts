// How the mail writes figures: fixed decimals, so a reader compares day with week at a glance, and the
// same rounding everywhere in a message. Null is "—" with the reason beside it where there is one.
import type { ImportKind, Role } from '#shared/schemas/enums.ts';

const fixed = (n: number, digits: number) => n.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits });

/** Hours with one decimal: "12.5 h". */
export const hoursText = (h: number | null) => (h === null ? '—' : `${fixed(h, 1)} h`);

/** A 0–1 fraction as a percentage with one decimal: "97.3 %". */
export const percentText = (f: number | null) => (f === null ? '—' : `${fixed(f * 100, 1)} %`);

/** An amount of money in whole units with its currency: "1,234 EUR". */
export const moneyText = (amount: number | null, currency: string | null) => (amount === null ? '—' : `${fixed(amount, 0)}${currency ? ` ${currency}` : ''}`);

/** A volume in whole cubic metres: "1,250 m³". */
export const volumeText = (m3: number | null) => (m3 === null ? '—' : `${fixed(m3, 0)} m³`);

export const countText = (n: number) => fixed(n, 0);

/** A signed percentage change with one decimal: "−12.0 %", "+15.2 %". */
export const changeText = (pct: number) => `${pct < 0 ? '−' : '+'}${fixed(Math.abs(pct), 1)} %`;

/** An instant in a zone, to the minute: "2025-01-07 14:05 (UTC)". */
export function instantText(at: Date | string, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(new Date(at));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')} (${timeZone})`;
}

export const roleNames: Record<Role, string> = { admin: 'administrator', engineer: 'engineer', manager: 'manager', finance: 'finance' };

export const kindNames: Record<ImportKind, string> = {
  historian: 'historian export',
  tags: 'tag map',
  assets: 'asset register',
  'work-orders': 'work orders',
  elements: 'element register',
  'job-steps': 'job steps',
};
