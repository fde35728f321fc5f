import { ResponsiveBar, type BarCustomLayerProps } from '@nivo/bar';
import { chartColors, chartTheme } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatHours, formatNumber, formatShare } from '../../../lib/format.ts';

export interface ParetoBar {
  [key: string]: string | number;
  key: string;
  unplanned: number;
  planned: number;
  share: number;
  cumulative: number;
  events: number;
}

/** Ticks of the cumulative-share axis: 80 % is one of them, so the 80 % line is labelled on the axis, clear of bars and line. */
const shareTicks = [0, 0.25, 0.5, 0.8, 1] as const;

/** The cumulative share as a line over the bars, on its own 0–100 % axis at the right, with the 80 % line. */
function CumulativeLine({ bars, innerWidth, innerHeight }: BarCustomLayerProps<ParetoBar>) {
  const centres = new Map<string, { x: number; cumulative: number }>();
  for (const bar of bars) {
    const d = bar.data.data;
    if (!centres.has(d.key)) centres.set(d.key, { x: bar.x + bar.width / 2, cumulative: d.cumulative });
  }
  const points = [...centres.values()].sort((a, b) => a.x - b.x);
  const y = (share: number) => innerHeight * (1 - share);
  return (
    <g>
      <line x1={0} x2={innerWidth} y1={y(0.8)} y2={y(0.8)} stroke={chartColors.muted} strokeDasharray="4 4" />
      <path d={points.map((p, i) => `${i === 0 ? 'M' : 'L'}${p.x},${y(p.cumulative)}`).join('')} fill="none" stroke={chartColors.caution} strokeWidth={2} />
      {points.map((p) => (
        <circle key={p.x} cx={p.x} cy={y(p.cumulative)} r={3.5} fill="#ffffff" stroke={chartColors.caution} strokeWidth={2} />
      ))}
      <g transform={`translate(${innerWidth},0)`}>
        <line y1={0} y2={innerHeight} stroke="#b0c2c9" />
        {shareTicks.map((t) => (
          <g key={t} transform={`translate(0,${y(t)})`}>
            <line x2={5} stroke="#b0c2c9" />
            <text x={8} dy="0.32em" fontSize={11} fill={t === 0.8 ? chartColors.ink : '#4d6873'} fontWeight={t === 0.8 ? 700 : undefined}>
              {formatShare(t, 0)}
            </text>
          </g>
        ))}
        <text transform={`translate(48,${innerHeight / 2}) rotate(90)`} textAnchor="middle" fontSize={12} fontWeight={700} fill="#37474f">
          Cumulative share of hours
        </text>
      </g>
    </g>
  );
}

/** Pareto of downtime hours (unplanned and planned stacked), largest first, with the cumulative share. */
export function ParetoChart({ bars, axisLabel }: { bars: readonly ParetoBar[]; axisLabel: string }) {
  return (
    <ResponsiveBar<ParetoBar>
      data={bars}
      keys={['unplanned', 'planned']}
      indexBy="key"
      margin={{ top: 36, right: 64, bottom: 72, left: 60 }}
      padding={0.25}
      colors={[chartColors.fault, chartColors.primarySoft]}
      enableLabel={false}
      enableGridY
      theme={chartTheme}
      axisBottom={{ tickSize: 0, tickPadding: 6, tickRotation: bars.length > 5 ? -35 : 0 }}
      axisLeft={{ legend: axisLabel, legendPosition: 'middle', legendOffset: -48, format: (v) => formatNumber(Number(v), 0) }}
      layers={['grid', 'axes', 'bars', CumulativeLine, 'legends']}
      legends={[
        {
          dataFrom: 'keys',
          anchor: 'top-left',
          direction: 'row',
          translateY: -30,
          itemWidth: 100,
          itemHeight: 18,
          symbolSize: 10,
          data: [
            { id: 'unplanned', label: 'Unplanned', color: chartColors.fault },
            { id: 'planned', label: 'Planned', color: chartColors.primarySoft },
          ],
        },
      ]}
      animate={false}
      tooltip={({ data }) => (
        <ChartTooltip
          title={data.key}
          rows={[
            ['Unplanned', formatHours(data.unplanned, 1)],
            ['Planned', formatHours(data.planned, 1)],
            ['Stops', formatNumber(data.events, 0)],
            ['Share of hours', formatShare(data.share, 1)],
            ['Cumulative', formatShare(data.cumulative, 1)],
          ]}
        />
      )}
    />
  );
}
