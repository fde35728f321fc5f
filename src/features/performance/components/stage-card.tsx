import { lazy } from 'react';
import type { PerformanceReport } from '#shared/schemas/performance.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { seriesColors } from '../../../components/charts/chart-theme.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { NoteText } from '../../../components/ui/note-text.tsx';
import { formatChangePct, formatDate, formatDateTime, formatNumber } from '../../../lib/format.ts';
import type { ChangePoint } from './performance-chart.tsx';

const PerformanceChart = lazy(() => import('./performance-chart.tsx').then((m) => ({ default: m.PerformanceChart })));

type Stage = PerformanceReport['stages'][number];
// A daily point of the series (summary figures) or the latest day (every figure): the three changes and values are in both.
type Normalized = Stage['points'][number]['normalized'] | NonNullable<Stage['latest']>['normalized'];

interface Quantity {
  name: string;
  unit: string;
  color: string;
  /** Signed alert threshold, %. */
  threshold: number;
  /** [% change from the baseline, normalized value] of one day. */
  pick: (n: Normalized) => [number | null, number | null];
}

function quantities(t: Stage['settings']): Quantity[] {
  return [
    { name: 'Normalized permeate flow', unit: 'm³/h', color: seriesColors[0], threshold: -t.flowDropPct, pick: (n) => [n.permeateFlowChangePct ?? null, n.permeateFlowM3h ?? null] },
    { name: 'Normalized salt passage', unit: '%', color: seriesColors[1], threshold: t.saltPassageRisePct, pick: (n) => [n.saltPassageChangePct ?? null, n.saltPassagePct ?? null] },
    { name: 'Normalized differential pressure', unit: 'bar', color: seriesColors[2], threshold: t.dpRisePct, pick: (n) => [n.differentialPressureChangePct ?? null, n.differentialPressureBar ?? null] },
  ];
}

/** One quantity: its latest change from the baseline (flagged beyond the threshold) over its chart. */
function QuantityColumn({ q, stage }: { q: Quantity; stage: Stage }) {
  const [change, value] = stage.latest ? q.pick(stage.latest.normalized) : [null, null];
  const beyond = change !== null && (q.threshold < 0 ? change <= q.threshold : change >= q.threshold);
  const points: ChangePoint[] = stage.points.map((p) => {
    const [c, v] = q.pick(p.normalized);
    return { time: new Date(p.state.time), change: c, value: v };
  });
  return (
    <div className="min-w-0">
      <h3 className="text-sm font-bold text-basin-800">{q.name}</h3>
      <p className="mt-1 flex items-baseline gap-2">
        <span className="text-xl font-bold text-basin-950 tabular-nums">{formatChangePct(change)}</span>
        {beyond && <Badge tone="fault">beyond {formatChangePct(q.threshold, 0)}</Badge>}
      </p>
      <p className="text-xs text-basin-600 tabular-nums">
        {formatNumber(value, 2)} {q.unit} on the latest day; alert at {formatChangePct(q.threshold, 0)}
      </p>
      {points.length > 0 && (
        <ChartFrame label={`${q.name} of stage ${stage.asset}, % change from the baseline over ${points.length} days`} height={200}>
          <PerformanceChart quantity={q.name} unit={q.unit} color={q.color} threshold={q.threshold} points={points} baseline={stage.baseline ? new Date(stage.baseline.time) : null} />
        </ChartFrame>
      )}
    </div>
  );
}

/** One stage: normalized permeate flow, salt passage and ΔP against the baseline, latest day and history. */
export function StageCard({ stage }: { stage: Stage }) {
  const t = stage.settings;
  const baseline = stage.baseline;
  const setBy = baseline?.setBy;
  const baselineText = baseline
    ? setBy?.kind === 'cleaning'
      ? `Baseline ${formatDate(baseline.time)}: the first running day after the cleaning ${setBy.workOrder ?? ''} ended on ${formatDateTime(setBy.at)}.`
      : setBy?.kind === 'element-change-out'
        ? `Baseline ${formatDate(baseline.time)}: the first running day after ${setBy.elements} ${setBy.elements === 1 ? 'element was' : 'elements were'} replaced (change-out ending ${formatDateTime(setBy.at)}).`
        : `Baseline ${formatDate(baseline.time)}: the first running day of the data (no cleaning or element change-out since).`
    : 'No baseline: the stage has no day of complete running data in this window.';

  return (
    <Card
      title={`Stage ${stage.asset}`}
      description={
        <>
          {stage.train && <>Train {stage.train}. </>}
          {baselineText}
          {stage.latest && <> Latest day {formatDate(stage.latest.state.time)}.</>}
        </>
      }
      actions={stage.alerts.length > 0 ? <Badge tone="fault">{stage.alerts.length === 1 ? '1 alert' : `${stage.alerts.length} alerts`}</Badge> : <Badge tone="ok">no alert</Badge>}
    >
      {stage.points.length > 0 ? (
        <>
          <div className="grid gap-6 lg:grid-cols-3">
            {quantities(t).map((q) => (
              <QuantityColumn key={q.name} q={q} stage={stage} />
            ))}
          </div>
          <p className="mt-3 text-xs text-basin-600">
            % change from the baseline of daily means over the hours the train ran throughout, normalized to the baseline conditions (ASTM D4516;
            temperature correction U = {formatNumber(t.uBelow25K, 0)} K below 25 °C, {formatNumber(t.uAtOrAbove25K, 0)} K above; {t.feedBrineAverage}{' '}
            feed-brine average). Days before the baseline are shown against it but raise no alert.
          </p>
        </>
      ) : (
        <p className="text-sm text-basin-600">No running day with every quantity measured in this window.</p>
      )}
      {stage.notes.length > 0 && (
        <ul className="mt-2 list-disc space-y-0.5 pl-5 text-xs text-basin-600">
          {stage.notes.map((n) => (
            <li key={n}>
              <NoteText text={n} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
