import type { ReactNode } from 'react';
import { Card } from '../../../components/ui/card.tsx';
import { formatDate, formatMoney, formatNumber, formatShare } from '../../../lib/format.ts';
import { useForecast } from '../api/get-forecast.ts';
import type { ElementLifeParams } from '../api/get-element-life.ts';
import { forecastTotals, monthLabel, monthShortLabel } from '../utils/forecast.ts';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

/** Dashboard: expected element replacements and their cost over the next 12 months, with the busiest months. */
export function ForecastSummaryCard({ params, currency, footer }: { params: ElementLifeParams; currency: string; footer?: ReactNode }) {
  const report = useForecast(params);
  const { count, cost, inService, single } = forecastTotals(report);
  const busiest = [...report.totals].sort((a, b) => b.expectedCount - a.expectedCount).slice(0, 3);
  const band = `${formatShare(report.confidence, 0)} band`;
  const top = Math.max(...report.totals.map((m) => m.expectedCount), 1e-9);
  return (
    <Card title="Element replacements, next 12 months" description={`Forecast from the Weibull fit for the ${formatNumber(inService, 0)} elements in service on ${formatDate(report.asOf)}, each at its age then.`}>
      <FreshnessBanner answer={report} compact />
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3">
        <div>
          <dt className="text-sm text-basin-600">Expected replacements</dt>
          <dd className="text-3xl font-bold text-basin-950 tabular-nums">{formatNumber(count, 0)}</dd>
          {single?.countLower != null && single.countUpper != null && (
            <dd className="text-xs text-basin-600 tabular-nums">
              {band} {formatNumber(single.countLower, 0)} – {formatNumber(single.countUpper, 0)}
            </dd>
          )}
        </div>
        <div>
          <dt className="text-sm text-basin-600">Expected cost</dt>
          <dd className="text-3xl font-bold text-basin-950 tabular-nums">{formatMoney(cost, currency)}</dd>
          {single?.costLower != null && single.costUpper != null && (
            <dd className="text-xs text-basin-600 tabular-nums">
              {band} {formatMoney(single.costLower, currency)} – {formatMoney(single.costUpper, currency)}
            </dd>
          )}
        </div>
      </dl>
      {report.totals.length > 0 && (
        <div className="mt-4" aria-hidden="true">
          <div className="flex h-16 items-end gap-1">
            {report.totals.map((m) => (
              <div key={m.label} className="flex-1 rounded-t-sm bg-tide-600" style={{ height: `${Math.max(2, (m.expectedCount / top) * 100)}%` }} title={`${monthLabel(m)}: ${formatNumber(m.expectedCount, 1)}`} />
            ))}
          </div>
          <div className="mt-1 flex gap-1 text-center text-[10px] text-basin-600">
            {report.totals.map((m) => (
              <span key={m.label} className="flex-1 truncate">
                {monthShortLabel(m.label)}
              </span>
            ))}
          </div>
        </div>
      )}
      {busiest.length > 0 && (
        <p className="mt-3 text-sm text-basin-700">
          Busiest months: {busiest.map((m) => `${monthLabel(m)} (${formatNumber(m.expectedCount, 1)})`).join(', ')}.
        </p>
      )}
      {footer}
    </Card>
  );
}
