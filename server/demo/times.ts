import { TZDate } from '@date-fns/tz';

export const MINUTE = 60_000;
export const HOUR = 3_600_000;
export const DAY = 86_400_000;

/** ISO 8601 in UTC to the second, e.g. `2024-03-01T12:35:00Z`. */
export function isoUtc(ms: number): string {
  return `${new Date(ms).toISOString().slice(0, 19)}Z`;
}

export function isoOrEmpty(ms: number | null): string {
  return ms === null ? '' : isoUtc(ms);
}

export function roundToMinute(ms: number): number {
  return Math.round(ms / MINUTE) * MINUTE;
}

/** The instant of a local wall-clock time on the local day of `ms`, `dayOffset` days later. */
export function localTimeOnDay(ms: number, timeZone: string, dayOffset: number, hour: number, minute = 0): number {
  const local = new TZDate(ms, timeZone);
  return new TZDate(local.getFullYear(), local.getMonth(), local.getDate() + dayOffset, hour, minute, timeZone).getTime();
}

/**
 * The first instant at or after `ms` that falls on the day shift [fromHour, toHour) local time:
 * `ms` itself when it is on shift, else the next shift start.
 */
export function onDayShift(ms: number, timeZone: string, fromHour: number, toHour: number): number {
  const hour = new TZDate(ms, timeZone).getHours();
  if (hour >= fromHour && hour < toHour) return ms;
  return localTimeOnDay(ms, timeZone, hour < fromHour ? 0 : 1, fromHour);
}
