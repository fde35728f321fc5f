import { ResponsiveBar, type BarCustomLayerProps } from '@nivo/bar';
import { chartColors, chartTheme } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatNumber } from '../../../lib/format.ts';

export interface ForecastBar {
  [key: string]: string | number;
  month: string;
  count: number;
  /** -1 when there is no band (several groups: bands do not add up). */
  lower: number;
  upper: number;
  cost: string;
}

function Band({ bars, yScale }: BarCustomLayerProps<ForecastBar>) {
  const scale = yScale as (v: number) => number;
  return (
    <g>
      {bars.map((bar) => {
        const d = bar.data.data;
        if (d.lower < 0) return null;
        const x = bar.x + bar.width / 2;
        const cap = Math.min(10, bar.width * 0.6) / 2;
        const y1 = scale(d.lower);
        const y2 = scale(d.upper);
        return (
          <g key={bar.key} stroke={chartColors.ink} strokeWidth={1.5}>
            <line x1={x} x2={x} y1={y1} y2={y2} />
            <line x1={x - cap} x2={x + cap} y1={y1} y2={y1} />
            <line x1={x - cap} x2={x + cap} y1={y2} y2={y2} />
          </g>
        );
      })}
    </g>
  );
}

/** Expected element replacements per month, with the band of the fit's uncertainty as whiskers. */
export function ForecastChart({ bars, bandLabel }: { bars: readonly ForecastBar[]; bandLabel: string }) {
  const top = Math.max(...bars.map((b) => Math.max(b.count, b.upper)), 1);
  return (
    <ResponsiveBar<ForecastBar>
      data={bars}
      keys={['count']}
      indexBy="month"
      margin={{ top: 12, right: 12, bottom: 56, left: 56 }}
      padding={0.3}
      valueScale={{ type: 'linear', min: 0, max: top * 1.1, nice: true }}
      colors={[chartColors.primary]}
      enableLabel={false}
      enableGridY
      theme={chartTheme}
      axisBottom={{ tickRotation: -35, tickSize: 0, tickPadding: 6 }}
      axisLeft={{ legend: 'Expected replacements, elements', legendPosition: 'middle', legendOffset: -44, format: (v) => formatNumber(Number(v), 1) }}
      layers={['grid', 'axes', 'bars', Band]}
      animate={false}
      tooltip={({ data }) => (
        <ChartTooltip
          title={data.month}
          rows={[
            ['Expected', `${formatNumber(data.count, 1)} elements`],
            ...(data.lower >= 0 ? ([[bandLabel, `${formatNumber(data.lower, 1)} – ${formatNumber(data.upper, 1)}`]] as const) : []),
            ['Expected cost', data.cost],
          ]}
        />
      )}
    />
  );
}
