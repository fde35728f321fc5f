import { lazy } from 'react';
import type { PerformanceReport } from '#shared/schemas/kpi-ops.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { formatChangePct, formatDate, formatDateTime, formatNumber } from '../../../lib/format.ts';
import type { PerformanceSeriesPoint } from './performance-chart.tsx';

const PerformanceChart = lazy(() => import('./performance-chart.tsx').then((m) => ({ default: m.PerformanceChart })));

type Stage = PerformanceReport['stages'][number];

function Latest({ label, value, unit, change, alertAt }: { label: string; value: number | null; unit: string; change: number | null; alertAt: number }) {
  const beyond = change !== null && (alertAt < 0 ? change <= alertAt : change >= alertAt);
  return (
    <div>
      <dt className="text-sm text-basin-600">{label}</dt>
      <dd className="mt-0.5 flex items-baseline gap-2">
        <span className="text-xl font-bold text-basin-950 tabular-nums">{formatChangePct(change)}</span>
        {beyond && <Badge tone="fault">beyond {formatChangePct(alertAt, 0)}</Badge>}
      </dd>
      <dd className="text-xs text-basin-600 tabular-nums">
        {formatNumber(value, 2)} {unit} normalized
      </dd>
    </div>
  );
}

/** One stage: its latest normalized figures, the chart against the baseline, and what the baseline is. */
export function StageCard({ stage }: { stage: Stage }) {
  const t = stage.settings;
  const latest = stage.latest?.normalized;
  const points: PerformanceSeriesPoint[] = stage.points.map((p) => ({
    time: new Date(p.state.time),
    flow: p.normalized.permeateFlowChangePct,
    saltPassage: p.normalized.saltPassageChangePct,
    dp: p.normalized.differentialPressureChangePct,
  }));
  const baseline = stage.baseline;
  const baselineText = baseline
    ? baseline.reason === 'after-reset'
      ? `Baseline ${formatDate(baseline.time)}: the first running day after the element change or cleaning of ${formatDateTime(baseline.resetAt)}.`
      : `Baseline ${formatDate(baseline.time)}: the first running day of the data.`
    : 'No baseline: the stage has no day of complete running data in this window.';

  return (
    <Card
      title={`Stage ${stage.asset}`}
      description={
        <>
          {stage.train && <>Train {stage.train}. </>}
          {baselineText}
        </>
      }
      actions={stage.alerts.length > 0 ? <Badge tone="fault">{stage.alerts.length === 1 ? '1 alert' : `${stage.alerts.length} alerts`}</Badge> : <Badge tone="ok">no alert</Badge>}
    >
      {latest && stage.latest && (
        <>
          <p className="mb-2 text-xs text-basin-600">Latest day {formatDate(stage.latest.state.time)}, change from the baseline:</p>
          <dl className="mb-4 grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-3">
            <Latest label="Normalized permeate flow" value={latest.permeateFlowM3h} unit="m³/h" change={latest.permeateFlowChangePct} alertAt={-t.flowDropPct} />
            <Latest label="Normalized salt passage" value={latest.saltPassagePct} unit="%" change={latest.saltPassageChangePct} alertAt={t.saltPassageRisePct} />
            <Latest label="Normalized differential pressure" value={latest.differentialPressureBar} unit="bar" change={latest.differentialPressureChangePct} alertAt={t.dpRisePct} />
          </dl>
        </>
      )}
      {points.length > 0 ? (
        <ChartFrame
          label={`Normalized performance of stage ${stage.asset}, ${points.length} days`}
          height={300}
          caption={`Daily means of the hours the train ran throughout, normalized to the baseline conditions (ASTM D4516; temperature correction U = ${formatNumber(t.uBelow25K, 0)} K below 25 °C, ${formatNumber(t.uAtOrAbove25K, 0)} K above; ${t.feedBrineAverage} feed-brine average). Days before the baseline are shown against it but raise no alert.`}
        >
          <PerformanceChart points={points} baseline={baseline ? new Date(baseline.time) : null} thresholds={{ flowDropPct: t.flowDropPct, saltPassageRisePct: t.saltPassageRisePct, dpRisePct: t.dpRisePct }} />
        </ChartFrame>
      ) : (
        <p className="text-sm text-basin-600">No running day with every quantity measured in this window.</p>
      )}
      {stage.notes.length > 0 && (
        <ul className="mt-3 list-disc space-y-0.5 pl-5 text-xs text-basin-600">
          {stage.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      )}
    </Card>
  );
}
