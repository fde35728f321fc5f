import { lazy } from 'react';
import { vesselWorkCautions } from '#shared/cautions.ts';
import type { ForecastReport } from '#shared/schemas/forecast.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { NotesDetails } from '../../../components/ui/notes-details.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { SafetyNote } from '../../../components/ui/safety-note.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDate, formatMoney, formatNumber, formatShare } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { useForecast } from '../api/get-forecast.ts';
import type { ElementLifeParams } from '../api/get-element-life.ts';
import { forecastTotals, monthLabel } from '../utils/forecast.ts';
import { groupKeyLabel } from '../utils/params.ts';
import type { ForecastBar } from './forecast-chart.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const ForecastChart = lazy(() => import('./forecast-chart.tsx').then((m) => ({ default: m.ForecastChart })));

type Group = ForecastReport['groups'][number];

function Range({ lower, upper, format }: { lower: number | null; upper: number | null; format: (v: number) => string }) {
  if (lower === null || upper === null) return <span className="text-basin-600">no band</span>;
  return (
    <span className="whitespace-nowrap text-basin-700">
      {format(lower)} – {format(upper)}
    </span>
  );
}

/** The replacement forecast for the next 12 months: chart by month, totals and cost, and the cautions of vessel work. */
export function ForecastPanel({ params, currency }: { params: ElementLifeParams; currency: string }) {
  const report = useForecast(params);
  const money = (v: number) => formatMoney(v, currency);
  const bandLabel = `${formatShare(report.confidence, 0)} band`;
  const { count, cost, inService, forecastInService, single } = forecastTotals(report);
  const byMonth = new Map(report.groups.length === 1 ? report.groups[0].months.map((m) => [m.label, m]) : []);
  const bars: ForecastBar[] = report.totals.map((m) => {
    const band = byMonth.get(m.label);
    return {
      month: monthLabel({ ...m, partial: band?.partial }),
      count: m.expectedCount,
      lower: band?.countLower ?? -1,
      upper: band?.countUpper ?? -1,
      cost: money(m.expectedCost),
    };
  });
  const columns: Column<Group>[] = [
    { id: 'group', header: 'Group', sortValue: (g) => g.key, cell: (g) => <span className="font-bold whitespace-nowrap">{groupKeyLabel(g.key)}</span> },
    { id: 'inService', header: 'In service', align: 'right', sortValue: (g) => g.inService, cell: (g) => formatNumber(g.inService, 0) },
    { id: 'count', header: 'Expected replacements', align: 'right', sortValue: (g) => g.total.expectedCount, cell: (g) => formatNumber(g.total.expectedCount, 1) },
    {
      id: 'countBand',
      header: bandLabel,
      align: 'right',
      cell: (g) => <Range lower={g.total.countLower} upper={g.total.countUpper} format={(v) => formatNumber(v, 1)} />,
    },
    { id: 'cost', header: 'Expected cost', align: 'right', sortValue: (g) => g.total.expectedCost, cell: (g) => money(g.total.expectedCost) },
    { id: 'costBand', header: `Cost ${bandLabel}`, align: 'right', cell: (g) => <Range lower={g.total.costLower} upper={g.total.costUpper} format={money} /> },
  ];
  if (report.groups.some((g) => Object.keys(g.reasons ?? {}).length > 0)) {
    columns.push({
      id: 'note',
      header: 'Note',
      cell: (g) => <span className="text-xs text-basin-600">{Object.values(g.reasons ?? {}).map((r) => nullReasonText(r)).join(' ') || '—'}</span>,
    });
  }

  return (
    <Card
      title="Replacement forecast, next 12 months"
      description={
        <>
          Expected life-ending element events from the Weibull fit, for the {formatNumber(inService, 0)} elements in service at the window’s end ({formatDate(report.asOf)}),
          each at its age then; priced at the element unit cost.{' '}
          {forecastInService < inService && `${formatNumber(inService - forecastInService, 0)} of them have no Weibull fit and are not forecast (see the notes). `}
          {report.renewal ? 'Replacements that fail again are counted.' : 'First events only: a replacement that fails again is not counted.'}
        </>
      }
    >
      <FreshnessBanner answer={report} />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0 space-y-5">
          <dl className="grid grid-cols-2 gap-x-6 gap-y-3 sm:grid-cols-3">
            <div>
              <dt className="text-sm text-basin-600">Expected replacements</dt>
              <dd className="text-2xl font-bold text-basin-950 tabular-nums">{formatNumber(count, 1)}</dd>
              {single && single.countLower !== null && single.countUpper !== null && (
                <dd className="text-xs text-basin-600 tabular-nums">
                  {bandLabel} {formatNumber(single.countLower, 1)} – {formatNumber(single.countUpper, 1)}
                </dd>
              )}
            </div>
            <div>
              <dt className="text-sm text-basin-600">Expected cost</dt>
              <dd className="text-2xl font-bold text-basin-950 tabular-nums">{money(cost)}</dd>
              {single && single.costLower !== null && single.costUpper !== null && (
                <dd className="text-xs text-basin-600 tabular-nums">
                  {bandLabel} {money(single.costLower)} – {money(single.costUpper)}
                </dd>
              )}
            </div>
            <div>
              <dt className="text-sm text-basin-600">Elements in service at the window’s end</dt>
              <dd className="text-2xl font-bold text-basin-950 tabular-nums">{formatNumber(inService, 0)}</dd>
            </div>
          </dl>
          {report.windowTreatment && <p className="text-sm text-basin-700">{report.windowTreatment.text}</p>}
          <ChartFrame
            label={`Expected element replacements per month, ${formatNumber(count, 1)} in total`}
            height={300}
            caption={
              report.groups.length === 1
                ? `Whiskers: ${bandLabel} (${report.bandMethod}).`
                : `Bars add up the ${report.groups.length} groups; the bands of separate fits do not add up, so each group’s band is in the table below.`
            }
          >
            <ForecastChart bars={bars} bandLabel={bandLabel} />
          </ChartFrame>
        </div>
        <SafetyNote cautions={vesselWorkCautions} className="self-start" />
      </div>
      {report.groups.length > 1 && (
        <div className="mt-6">
          <Table caption="Forecast by group" columns={columns} rows={report.groups} rowKey={(g) => g.key} />
        </div>
      )}
      <NotesDetails notes={report.notes?.filter((n) => n !== report.windowTreatment?.text)} className="mt-4" />
      <ProvenanceDetails provenance={report.provenance} className="mt-4" />
    </Card>
  );
}
