import { ResponsiveLine, type LineCustomSvgLayerProps } from '@nivo/line';
import { chartColors, chartTheme, seriesColors } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatDays, formatNumber, formatShare } from '../../../lib/format.ts';
import { daysToYears } from '../utils/params.ts';
import type { SurvivalStep } from '../utils/km.ts';

export interface SurvivalSeries {
  id: string;
  steps: readonly SurvivalStep[];
}

type Series = { id: string; data: { x: number; y: number; days: number }[] };

/** A step path through (x, y) points: horizontal to the next x, then vertical. */
function stepPath(points: readonly { x: number; y: number }[]): string {
  return points.map((p, i) => (i === 0 ? `M${p.x},${p.y}` : `H${p.x}V${p.y}`)).join('');
}

/** The Greenwood band of a single curve, as a shaded step area between the lower and upper bound. */
function bandLayer(steps: readonly SurvivalStep[]) {
  return function Band({ xScale, yScale }: LineCustomSvgLayerProps<Series>) {
    const x = xScale as unknown as (v: number) => number;
    const y = yScale as unknown as (v: number) => number;
    const usable = steps.filter((s) => s.lower !== null && s.upper !== null);
    if (usable.length < 2) return null;
    const upper = usable.map((s) => ({ x: x(daysToYears(s.tDays)), y: y(s.upper!) }));
    const lower = usable.map((s) => ({ x: x(daysToYears(s.tDays)), y: y(s.lower!) }));
    const back = [...lower].reverse();
    // Walk the upper steps forward, then the lower steps backward (mirrored: vertical, then horizontal).
    const d = `${stepPath(upper)}V${back[0].y}${back
      .slice(1)
      .map((p, i) => `H${back[i].x}V${p.y}`)
      .join('')}H${back[back.length - 1].x}Z`;
    return <path d={d} fill={chartColors.primarySoft} fillOpacity={0.45} stroke="none" />;
  };
}

/**
 * Kaplan–Meier survival of element lives per group, drawn as steps (the estimate holds between events).
 * With one group, its Greenwood confidence band is shaded behind the curve.
 */
export function SurvivalChart({ series, confidenceLabel }: { series: readonly SurvivalSeries[]; confidenceLabel: string }) {
  const data: Series[] = series.map((s) => ({ id: s.id, data: s.steps.map((p) => ({ x: daysToYears(p.tDays), y: p.survival, days: p.tDays })) }));
  const layers = ['grid', 'markers', 'axes', 'lines', 'crosshair', 'mesh', 'legends'] as const;
  return (
    <ResponsiveLine<Series>
      data={data}
      xScale={{ type: 'linear', min: 0, max: 'auto' }}
      yScale={{ type: 'linear', min: 0, max: 1 }}
      curve="stepAfter"
      margin={{ top: 12, right: series.length > 1 ? 150 : 24, bottom: 48, left: 56 }}
      colors={[...seriesColors]}
      lineWidth={2}
      enablePoints={false}
      enableGridX={false}
      useMesh
      theme={chartTheme}
      axisBottom={{ legend: 'Element age, years', legendPosition: 'middle', legendOffset: 38 }}
      axisLeft={{ legend: 'Still in service', legendPosition: 'middle', legendOffset: -46, format: (v) => formatShare(Number(v), 0), tickValues: 5 }}
      markers={[{ axis: 'y', value: 0.5, legend: 'half still in service', legendPosition: 'top-right', lineStyle: { stroke: chartColors.muted, strokeDasharray: '4 4', strokeWidth: 1 }, textStyle: { fill: chartColors.muted, fontSize: 11 } }]}
      layers={series.length === 1 ? ['grid', 'markers', bandLayer(series[0].steps), 'axes', 'lines', 'crosshair', 'mesh'] : [...layers]}
      legends={
        series.length > 1
          ? [{ anchor: 'right', direction: 'column', translateX: 140, itemWidth: 130, itemHeight: 20, symbolSize: 10, symbolShape: 'circle' }]
          : []
      }
      animate={false}
      tooltip={({ point }) => (
        <ChartTooltip
          title={String(point.seriesId)}
          rows={[
            ['Age', `${formatDays(point.data.days)} (${formatNumber(point.data.x, 1)} years)`],
            ['Still in service', formatShare(point.data.y, 1)],
            ...(series.length === 1 ? ([['Band', `${confidenceLabel} Greenwood`]] as const) : []),
          ]}
        />
      )}
    />
  );
}
