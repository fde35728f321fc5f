import { lazy, useState } from 'react';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { SafetyNote } from '../../../components/ui/safety-note.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { formatDate } from '../../../lib/format.ts';
import { useTimeToComplete, type TimeToCompleteParams } from '../api/get-time-to-complete.ts';
import { GroupsTable } from './groups-table.tsx';
import { GuidedComparison } from './guided-comparison.tsx';
import { JobsTable } from './jobs-table.tsx';
import type { LearningPoint } from './learning-curve-chart.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const LearningCurveChart = lazy(() => import('./learning-curve-chart.tsx').then((m) => ({ default: m.LearningCurveChart })));

type CurveView = 'byPeriod' | 'bySequence';

/** How long jobs take: groups, guided vs unguided, learning curve and the jobs, beside the cautions of vessel work. */
export function TimeToCompletePanel({ params }: { params: TimeToCompleteParams }) {
  const report = useTimeToComplete(params);
  const [view, setView] = useState<CurveView>('byPeriod');
  const buckets = report.learningCurve?.[view] ?? [];
  const points: LearningPoint[] = buckets.map((b) => ({ label: b.label, n: b.n, median: b.medianHours, mean: b.meanHours }));

  return (
    <div className="space-y-6">
      <FreshnessBanner answer={report} />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <GuidedComparison groups={report.groups} />
        <SafetyNote cautions={vesselWorkCautions} className="self-start" />
      </div>

      <div className="space-y-2">
        <GroupsTable groups={report.groups} quantileMethod={report.quantileMethod} />
        {report.procedureDefinition && <p className="text-xs text-basin-600">How jobs are named: {report.procedureDefinition}</p>}
      </div>

      <Card
        title="Learning curve"
        description={`Median and mean duration of the jobs in each bucket, ${report.from ? `${formatDate(report.from)} – ${formatDate(report.to)}` : 'in the window'}. A falling line means the crews get faster.`}
        actions={
          <Select
            label="Buckets"
            hideLabel
            compact
            value={view}
            options={[
              { value: 'byPeriod', label: 'By quarter' },
              { value: 'bySequence', label: 'By every 10 jobs' },
            ]}
            onChange={(e) => setView(e.target.value as CurveView)}
          />
        }
      >
        {points.filter((p) => p.median !== null).length > 0 ? (
          <ChartFrame label={`Learning curve of job duration, ${points.length} buckets`} height={300}>
            <LearningCurveChart points={points} />
          </ChartFrame>
        ) : (
          <p className="text-sm text-basin-600">No jobs to draw a learning curve from.</p>
        )}
      </Card>

      {report.skipped && report.skipped.length > 0 && (
        <p className="text-sm text-basin-700">
          {report.skipped.length} work {report.skipped.length === 1 ? 'order was' : 'orders were'} left out because their step times give no positive
          duration: {report.skipped.map((s) => s.woNumber).join(', ')}.
        </p>
      )}

      <JobsTable jobs={report.jobs} />
      <ProvenanceDetails provenance={report.provenance} />
    </div>
  );
}
