import { lazy } from 'react';
import type { PerformanceReport } from '#shared/schemas/kpi-ops.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { seriesColors } from '../../../components/charts/chart-theme.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { formatChangePct, formatDate, formatDateTime, formatNumber } from '../../../lib/format.ts';
import type { ChangePoint } from './performance-chart.tsx';

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
  const series = (pick: (n: Stage['points'][number]['normalized']) => [number | null, number | null]): ChangePoint[] =>
    stage.points.map((p) => {
      const [change, value] = pick(p.normalized);
      return { time: new Date(p.state.time), change, value };
    });
  const charts = [
    { quantity: 'Normalized permeate flow', unit: 'm³/h', color: seriesColors[0], threshold: -t.flowDropPct, points: series((n) => [n.permeateFlowChangePct, n.permeateFlowM3h]) },
    { quantity: 'Normalized salt passage', unit: '%', color: seriesColors[1], threshold: t.saltPassageRisePct, points: series((n) => [n.saltPassageChangePct, n.saltPassagePct]) },
    { quantity: 'Normalized differential pressure', unit: 'bar', color: seriesColors[2], threshold: t.dpRisePct, points: series((n) => [n.differentialPressureChangePct, n.differentialPressureBar]) },
  ];
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
      {stage.points.length > 0 ? (
        <>
          <div className="grid gap-4 lg:grid-cols-3">
            {charts.map((c) => (
              <div key={c.quantity} className="min-w-0">
                <h3 className="text-sm font-bold text-basin-800">{c.quantity}</h3>
                <p className="text-xs text-basin-600">% change from the baseline; alert at {formatChangePct(c.threshold, 0)}</p>
                <ChartFrame label={`${c.quantity} of stage ${stage.asset}, % change from the baseline over ${c.points.length} days`} height={200}>
                  <PerformanceChart {...c} baseline={baseline ? new Date(baseline.time) : null} />
                </ChartFrame>
              </div>
            ))}
          </div>
          <p className="mt-2 text-xs text-basin-600">
            Daily means of the hours the train ran throughout, normalized to the baseline conditions (ASTM D4516; temperature correction U ={' '}
            {formatNumber(t.uBelow25K, 0)} K below 25 °C, {formatNumber(t.uAtOrAbove25K, 0)} K above; {t.feedBrineAverage} feed-brine average). Days before
            the baseline are shown against it but raise no alert.
          </p>
        </>
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
