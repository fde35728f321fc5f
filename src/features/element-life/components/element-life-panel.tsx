import { lazy } from 'react';
import { elementGroupByValues } from '#shared/schemas/element-life.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { NotesDetails } from '../../../components/ui/notes-details.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { formatDate, formatNumber, formatShare } from '../../../lib/format.ts';
import { useKpiWindow } from '../../../lib/kpi-window.ts';
import { useElementLife, type ElementLifeParams } from '../api/get-element-life.ts';
import { survivalSteps } from '../utils/km.ts';
import { groupByLabels, groupKeyLabel } from '../utils/params.ts';
import { WeibullTable } from './weibull-table.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const SurvivalChart = lazy(() => import('./survival-chart.tsx').then((m) => ({ default: m.SurvivalChart })));

/** Element survival per group: Kaplan–Meier curves, the Weibull table and the lives used. */
export function ElementLifePanel({ params }: { params: ElementLifeParams }) {
  const report = useElementLife(params);
  const [, update] = useKpiWindow();
  const confidenceLabel = formatShare(report.confidence ?? params.confidence ?? 0.9, 0);
  const series = report.groups.filter((g) => g.km.length > 0).map((g) => ({ id: groupKeyLabel(g.key), steps: survivalSteps(g.km) }));
  const lives = report.groups.reduce((n, g) => n + g.n, 0);
  const events = report.groups.reduce((n, g) => n + g.events, 0);
  const enteredLate = report.groups.reduce((n, g) => n + (g.enteredLate ?? 0), 0);
  const window = report.from ? `${formatDate(report.from)} – ${formatDate(report.to)}` : 'the window';

  return (
    <div className="space-y-6">
      <FreshnessBanner answer={report} />
      <Card
        title="Element survival (Kaplan–Meier)"
        description={
          <>
            Share of elements still in service by age: {formatNumber(lives, 0)} element lives in service during {window}
            {enteredLate > 0 && ` (${formatNumber(enteredLate, 0)} of them installed before it, counted from their age at its start)`},{' '}
            {formatNumber(events, 0)} ended in it by failure, performance or damage; the others are censored (planned removal, or still in service at the window’s end).
          </>
        }
        actions={
          <Select
            label="Group by"
            compact
            className="w-56"
            value={params.groupBy}
            options={elementGroupByValues.map((v) => ({ value: v, label: groupByLabels[v] }))}
            onChange={(e) => update({ groupBy: e.target.value === 'all' ? undefined : e.target.value })}
          />
        }
      >
        {series.length > 0 ? (
          <ChartFrame
            label={`Kaplan–Meier survival curves of ${series.length} ${series.length === 1 ? 'group' : 'groups'}`}
            height={340}
            caption={series.length === 1 ? `Shaded: ${confidenceLabel} Greenwood confidence band. Dashed line: half of the elements still in service.` : 'Dashed line: half of the elements still in service.'}
          >
            <SurvivalChart series={series} confidenceLabel={confidenceLabel} />
          </ChartFrame>
        ) : (
          <p className="text-sm text-basin-600">No element lives in this window.</p>
        )}
        {report.windowTreatment && <p className="mt-3 text-sm text-basin-700">{report.windowTreatment.text}</p>}
      </Card>
      <WeibullTable groups={report.groups} confidenceLabel={confidenceLabel} />
      <NotesDetails notes={report.notes?.filter((n) => n !== report.windowTreatment?.text)} />
      <ProvenanceDetails provenance={report.provenance} />
    </div>
  );
}
