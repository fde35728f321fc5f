import type { ReportName } from '#shared/schemas/reports.ts';

/** Who each workbook is written for, for its card. */
export const readerOf: Record<ReportName, string> = {
  finance: 'For finance',
  manager: 'For plant managers',
  engineer: 'For maintenance engineers',
};

/** A file size in the units a person reads: 950 B, 24.1 kB, 3.2 MB. */
export function formatSize(bytes: number): string {
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
