import { lazy } from 'react';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { NotesDetails } from '../../../components/ui/notes-details.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { formatDate, formatShare } from '../../../lib/format.ts';
import { useKpiWindow } from '../../../lib/kpi-window.ts';
import { useReliability, type ReliabilityGroupBy, type ReliabilityParams } from '../api/get-reliability.ts';
import { groupLabel, wideIntervalExplanation, wideMtbfInterval } from '../utils/labels.ts';
import type { MtbfBar } from './mtbf-chart.tsx';
import { ReliabilitySummary } from './reliability-summary.tsx';
import { ReliabilityTable } from './reliability-table.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const MtbfChart = lazy(() => import('./mtbf-chart.tsx').then((m) => ({ default: m.MtbfChart })));

const groupByOptions: { value: ReliabilityGroupBy; label: string }[] = [
  { value: 'asset', label: 'Per asset' },
  { value: 'kind', label: 'Per asset kind' },
  { value: 'all', label: 'Scope only' },
];

/** The reliability page below its filters: headline figures, MTBF chart, per-asset table and inputs. */
export function ReliabilityPanel({ params }: { params: ReliabilityParams }) {
  const report = useReliability(params);
  const [, update] = useKpiWindow();
  const groups = report.groups ?? [];
  const confidenceLabel = formatShare(report.confidence, 0);
  const bars: MtbfBar[] = groups
    .filter((g) => g.mtbfHours !== null && g.mtbfLowerHours !== null)
    .map((g) => ({
      label: groupLabel(g),
      mtbf: g.mtbfHours!,
      lower: g.mtbfLowerHours!,
      upper: g.mtbfUpperHours ?? -1,
      failures: g.failures,
    }));
  const scopeName = report.asset ? `${report.asset} and the ${Math.max(0, (report.scope?.length ?? 1) - 1)} assets below it` : `the whole site${report.site ? ` ${report.site}` : ''}`;

  return (
    <div className="space-y-6">
      <FreshnessBanner answer={report} />
      <Card
        title={report.asset ? `Reliability of ${report.asset}` : 'Reliability of the site'}
        description={
          <>
            Failures of {scopeName}, {report.from ? `${formatDate(report.from)} – ${formatDate(report.to)}` : 'no data yet'}. MTBF bounds are{' '}
            {report.sides === 'one-sided-lower' ? 'one-sided' : 'two-sided'} at {confidenceLabel}, for a {report.terminated ?? 'time'}-terminated record
            (NIST/SEMATECH e-Handbook, ch. 8).
          </>
        }
      >
        <ReliabilitySummary figures={report} confidence={report.confidence} />
      </Card>

      <Card
        title="MTBF by asset"
        description="Shortest MTBF on top, on a logarithmic axis. The whisker spans the confidence bounds; an arrow means there is no upper bound."
        actions={
          <Select
            label="Group by"
            hideLabel
            compact
            value={params.groupBy}
            options={groupByOptions}
            onChange={(e) => update({ groupBy: e.target.value === 'asset' ? undefined : e.target.value })}
          />
        }
      >
        {bars.length > 0 ? (
          <ChartFrame label={`MTBF of ${bars.length} assets with ${confidenceLabel} bounds`} height={Math.max(160, bars.length * 24 + 60)}>
            <MtbfChart bars={bars} confidenceLabel={confidenceLabel} />
          </ChartFrame>
        ) : (
          <p className="text-sm text-basin-600">
            {params.groupBy === 'all' ? 'Choose per asset or per asset kind to compare assets.' : 'No asset has an MTBF in this window (no failures).'}
          </p>
        )}
      </Card>

      {params.groupBy !== 'all' && (
        <div className="space-y-2">
          <ReliabilityTable groups={groups} confidence={report.confidence} groupBy={params.groupBy} />
          {groups.some(wideMtbfInterval) && <p className="text-xs text-basin-600">{wideIntervalExplanation}</p>}
        </div>
      )}

      <NotesDetails notes={report.notes} />
      <ProvenanceDetails provenance={report.provenance} />
    </div>
  );
}
