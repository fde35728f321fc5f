import { ResponsiveLine } from '@nivo/line';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { chartColors, chartTheme } from '../../../components/charts/chart-theme.ts';
import { timeAxis } from '../../../components/charts/time-axis.ts';
import { useElementWidth } from '../../../components/charts/use-element-width.ts';
import { formatChangePct, formatDate, formatNumber } from '../../../lib/format.ts';

export interface ChangePoint {
  time: Date;
  /** % change from the baseline; null when undefined that day. */
  change: number | null;
  /** The normalized value itself, in `unit`. */
  value: number | null;
}

type Series = { id: string; data: { x: Date; y: number | null; value: number | null }[] };

export interface PerformanceChartProps {
  quantity: string;
  unit: string;
  color: string;
  points: readonly ChangePoint[];
  /** Signed alert threshold in %: −10 for a flow drop, +15 for a ΔP rise. */
  threshold: number;
  baseline: Date | null;
}

const margin = { top: 12, right: 12, bottom: 36, left: 48 };

/**
 * One normalized quantity of one stage as % change from its baseline, day by day, with the alert
 * threshold as a dashed line and the baseline day as a vertical line. The time axis gets as many
 * labels as the drawn width has room for (components/charts/time-axis.ts).
 */
export function PerformanceChart(props: PerformanceChartProps) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  return (
    <div ref={ref} className="h-full w-full">
      {width > 0 && <Chart {...props} innerWidth={width - margin.left - margin.right} />}
    </div>
  );
}

function Chart({ quantity, unit, color, points, threshold, baseline, innerWidth }: PerformanceChartProps & { innerWidth: number }) {
  const data: Series[] = [{ id: quantity, data: points.map((p) => ({ x: p.time, y: p.change, value: p.value })) }];
  const changes = points.flatMap((p) => (p.change === null ? [] : [p.change]));
  const min = Math.floor(Math.min(...changes, threshold, 0) - 2);
  const max = Math.ceil(Math.max(...changes, threshold, 0) + 2);
  const times = points.map((p) => p.time.getTime());
  const axis = timeAxis(new Date(Math.min(...times)), new Date(Math.max(...times)), innerWidth);
  return (
    <ResponsiveLine<Series>
      data={data}
      xScale={{ type: 'time', format: 'native', useUTC: false }}
      yScale={{ type: 'linear', min, max }}
      margin={margin}
      colors={[color]}
      lineWidth={1.5}
      enablePoints={false}
      enableGridX={false}
      useMesh
      theme={chartTheme}
      axisBottom={{ format: axis.format, tickValues: axis.tickValues, tickSize: 4 }}
      axisLeft={{ tickValues: 5, format: (v) => `${Number(v) > 0 ? '+' : ''}${v} %` }}
      markers={[
        { axis: 'y', value: 0, lineStyle: { stroke: chartColors.muted, strokeWidth: 1 } },
        {
          axis: 'y',
          value: threshold,
          lineStyle: { stroke: chartColors.fault, strokeDasharray: '6 4', strokeWidth: 1.5 },
          legend: `alert ${formatChangePct(threshold, 0)}`,
          legendPosition: threshold < 0 ? 'bottom-left' : 'top-left',
          textStyle: { fill: chartColors.fault, fontSize: 11 },
        },
        ...(baseline
          ? [
              {
                axis: 'x' as const,
                value: baseline,
                lineStyle: { stroke: chartColors.ink, strokeWidth: 1.5 },
                legend: 'baseline',
                // Clear of the threshold's dashed line: at the top when the threshold sits in the lower half of the axis.
                legendPosition: threshold < (min + max) / 2 ? ('top-left' as const) : ('bottom-left' as const),
                textStyle: { fill: chartColors.ink, fontSize: 11 },
              },
            ]
          : []),
      ]}
      animate={false}
      tooltip={({ point }) => (
        <ChartTooltip
          title={formatDate((point.data.x as Date).toISOString())}
          rows={[
            [quantity, formatChangePct(point.data.y as number | null)],
            ['Normalized', `${formatNumber(point.data.value, 2)} ${unit}`],
          ]}
        />
      )}
    />
  );
}
