import type { ForecastReport } from '#shared/schemas/forecast.ts';

type Month = ForecastReport['totals'][number];

const monthName = new Intl.DateTimeFormat(undefined, { month: 'short', year: 'numeric', timeZone: 'UTC' });

/** "Oct 2026"; a month the horizon only touches (it starts or ends inside it) is marked "(part)". */
export function monthLabel(m: Pick<Month, 'label' | 'from' | 'to'> & { partial?: boolean }): string {
  const [year, month] = m.label.split('-').map(Number);
  const name = Number.isFinite(year) && Number.isFinite(month) ? monthName.format(Date.UTC(year, month - 1, 15)) : m.label;
  // Older answers do not say `partial`: a span shorter than any month is one.
  const partial = m.partial ?? (Date.parse(m.to) - Date.parse(m.from)) / 86_400_000 < 27;
  return partial ? `${name} (part)` : name;
}

const monthShort = new Intl.DateTimeFormat(undefined, { month: 'short', timeZone: 'UTC' });

/** "Oct" from `2026-10`. */
export function monthShortLabel(label: string): string {
  const [year, month] = label.split('-').map(Number);
  return Number.isFinite(year) && Number.isFinite(month) ? monthShort.format(Date.UTC(year, month - 1, 15)) : label;
}

/**
 * Sums of the forecast over its groups (each group's own total is exact; a band exists only per group).
 * `inService` is every element in service at the window's end, as the answer counts it, including
 * those of a group that could not be forecast; `forecastInService` only those of the forecast groups.
 */
export function forecastTotals(report: ForecastReport) {
  const count = report.groups.reduce((n, g) => n + g.total.expectedCount, 0);
  const cost = report.groups.reduce((n, g) => n + g.total.expectedCost, 0);
  const forecastInService = report.groups.reduce((n, g) => n + g.inService, 0);
  const inService = report.inService ?? forecastInService;
  const single = report.groups.length === 1 ? report.groups[0].total : null;
  return { count, cost, inService, forecastInService, single };
}

