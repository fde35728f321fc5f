import { ResponsiveLine } from '@nivo/line';
import { chartColors, chartTheme, seriesColors } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatChangePct, formatDate } from '../../../lib/format.ts';

export interface PerformanceSeriesPoint {
  time: Date;
  flow: number | null;
  saltPassage: number;
  dp: number;
}

export interface Thresholds {
  flowDropPct: number;
  saltPassageRisePct: number;
  dpRisePct: number;
}

type Series = { id: string; data: { x: Date; y: number | null }[] };

const colors = { flow: seriesColors[0], saltPassage: seriesColors[1], dp: seriesColors[3] } as const;

/**
 * Normalized permeate flow, salt passage and differential pressure of one stage as % change from its
 * baseline, with each alert threshold as a dashed line in the colour of its series and the baseline day marked.
 */
export function PerformanceChart({ points, thresholds, baseline }: { points: readonly PerformanceSeriesPoint[]; thresholds: Thresholds; baseline: Date | null }) {
  const data: Series[] = [
    { id: 'Permeate flow', data: points.map((p) => ({ x: p.time, y: p.flow })) },
    { id: 'Salt passage', data: points.map((p) => ({ x: p.time, y: p.saltPassage })) },
    { id: 'Differential pressure', data: points.map((p) => ({ x: p.time, y: p.dp })) },
  ];
  const values = points.flatMap((p) => [p.flow ?? 0, p.saltPassage, p.dp]);
  const min = Math.min(...values, -thresholds.flowDropPct) - 3;
  const max = Math.max(...values, thresholds.dpRisePct, thresholds.saltPassageRisePct) + 3;
  const dash = { strokeDasharray: '6 4', strokeWidth: 1.5 };
  return (
    <ResponsiveLine<Series>
      data={data}
      xScale={{ type: 'time', format: 'native', useUTC: false }}
      yScale={{ type: 'linear', min, max }}
      margin={{ top: 16, right: 170, bottom: 44, left: 56 }}
      colors={[colors.flow, colors.saltPassage, colors.dp]}
      lineWidth={1.75}
      enablePoints={false}
      enableGridX={false}
      useMesh
      enableSlices={false}
      theme={chartTheme}
      axisBottom={{ format: '%b %Y', tickValues: 'every 2 months', tickSize: 5 }}
      axisLeft={{ legend: 'Change from baseline, %', legendPosition: 'middle', legendOffset: -46, format: (v) => `${Number(v) > 0 ? '+' : ''}${v}` }}
      markers={[
        { axis: 'y', value: 0, lineStyle: { stroke: chartColors.muted, strokeWidth: 1 } },
        { axis: 'y', value: -thresholds.flowDropPct, lineStyle: { stroke: colors.flow, ...dash }, legend: `flow alert ${formatChangePct(-thresholds.flowDropPct, 0)}`, legendPosition: 'bottom-left', textStyle: { fill: colors.flow, fontSize: 11 } },
        { axis: 'y', value: thresholds.saltPassageRisePct, lineStyle: { stroke: colors.saltPassage, ...dash }, legend: `salt passage alert ${formatChangePct(thresholds.saltPassageRisePct, 0)}`, legendPosition: 'top-left', textStyle: { fill: colors.saltPassage, fontSize: 11 } },
        { axis: 'y', value: thresholds.dpRisePct, lineStyle: { stroke: colors.dp, ...dash }, legend: `ΔP alert ${formatChangePct(thresholds.dpRisePct, 0)}`, legendPosition: 'top-left', textStyle: { fill: colors.dp, fontSize: 11 } },
        ...(baseline
          ? [{ axis: 'x' as const, value: baseline, lineStyle: { stroke: chartColors.ink, strokeWidth: 1.5 }, legend: 'baseline', legendPosition: 'top-left' as const, textStyle: { fill: chartColors.ink, fontSize: 11 } }]
          : []),
      ]}
      legends={[{ anchor: 'right', direction: 'column', translateX: 160, itemWidth: 150, itemHeight: 20, symbolSize: 10, symbolShape: 'circle' }]}
      animate={false}
      tooltip={({ point }) => (
        <ChartTooltip title={formatDate((point.data.x as Date).toISOString())} rows={[[String(point.seriesId), formatChangePct(point.data.y as number | null)]]} />
      )}
    />
  );
}
