import { ResponsiveLine } from '@nivo/line';
import { chartTheme, seriesColors } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatHours, formatNumber } from '../../../lib/format.ts';

export interface LearningPoint {
  label: string;
  n: number;
  median: number | null;
  mean: number | null;
}

type Series = { id: string; data: { x: string; y: number | null; n: number }[] };

/** Median and mean job duration per bucket (quarter, or every ten jobs) in time order. */
export function LearningCurveChart({ points }: { points: readonly LearningPoint[] }) {
  const data: Series[] = [
    { id: 'Median', data: points.map((p) => ({ x: p.label, y: p.median, n: p.n })) },
    { id: 'Mean', data: points.map((p) => ({ x: p.label, y: p.mean, n: p.n })) },
  ];
  return (
    <ResponsiveLine<Series>
      data={data}
      xScale={{ type: 'point' }}
      yScale={{ type: 'linear', min: 0, max: 'auto' }}
      margin={{ top: 16, right: 96, bottom: 48, left: 56 }}
      colors={[seriesColors[0], seriesColors[1]]}
      lineWidth={2}
      pointSize={7}
      pointBorderWidth={2}
      pointColor="#ffffff"
      pointBorderColor={{ from: 'seriesColor' }}
      enableGridX={false}
      useMesh
      theme={chartTheme}
      axisBottom={{ tickSize: 0, tickPadding: 8, tickRotation: points.length > 6 ? -30 : 0 }}
      axisLeft={{ legend: 'Job duration, hours', legendPosition: 'middle', legendOffset: -44, format: (v) => formatNumber(Number(v), 1) }}
      legends={[{ anchor: 'right', direction: 'column', translateX: 90, itemWidth: 80, itemHeight: 20, symbolSize: 10, symbolShape: 'circle' }]}
      animate={false}
      tooltip={({ point }) => (
        <ChartTooltip
          title={String(point.data.x)}
          rows={[
            [String(point.seriesId), formatHours(point.data.y, 2)],
            ['Jobs', formatNumber(point.data.n, 0)],
          ]}
        />
      )}
    />
  );
}
