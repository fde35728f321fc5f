import { ResponsiveBar, type BarCustomLayerProps } from '@nivo/bar';
import { chartColors, chartTheme } from '../../../components/charts/chart-theme.ts';
import { ChartTooltip } from '../../../components/charts/chart-frame.tsx';
import { formatHours, formatNumber } from '../../../lib/format.ts';

export interface MtbfBar {
  [key: string]: string | number;
  label: string;
  mtbf: number;
  lower: number;
  /** -1 when there is no upper bound (no failures). */
  upper: number;
  failures: number;
}

/** Draws each bar's confidence interval as a whisker; a bound past the axis ends in an arrow. */
function Whiskers({ bars, xScale, innerWidth }: BarCustomLayerProps<MtbfBar>) {
  const scale = xScale as (v: number) => number;
  return (
    <g>
      {bars.map((bar) => {
        const d = bar.data.data;
        const y = bar.y + bar.height / 2;
        const x1 = Math.max(0, scale(d.lower));
        const open = d.upper < 0 || scale(d.upper) > innerWidth;
        const x2 = open ? innerWidth : scale(d.upper);
        const cap = Math.min(8, bar.height * 0.8) / 2;
        return (
          <g key={bar.key} stroke={chartColors.ink} strokeWidth={1.5} fill="none">
            <line x1={x1} x2={x2} y1={y} y2={y} />
            <line x1={x1} x2={x1} y1={y - cap} y2={y + cap} />
            {open ? <path d={`M${x2 - 6},${y - cap} L${x2},${y} L${x2 - 6},${y + cap}`} /> : <line x1={x2} x2={x2} y1={y - cap} y2={y + cap} />}
          </g>
        );
      })}
    </g>
  );
}

/**
 * MTBF per asset as horizontal bars, worst first, with the confidence bounds as whiskers. The axis ends a
 * little past the longest MTBF: an upper bound beyond it is drawn as an arrow (the table gives its value).
 */
export function MtbfChart({ bars, confidenceLabel }: { bars: readonly MtbfBar[]; confidenceLabel: string }) {
  const longest = Math.max(...bars.map((b) => b.mtbf), 1);
  // Bars are listed bottom-up by nivo's horizontal layout: reverse so the shortest MTBF is on top.
  const data = [...bars].sort((a, b) => b.mtbf - a.mtbf);
  return (
    <ResponsiveBar<MtbfBar>
      data={data}
      keys={['mtbf']}
      indexBy="label"
      layout="horizontal"
      margin={{ top: 8, right: 24, bottom: 44, left: 104 }}
      padding={0.35}
      valueScale={{ type: 'linear', min: 0, max: longest * 1.35, nice: false }}
      colors={[chartColors.primarySoft]}
      borderColor={chartColors.primary}
      borderWidth={1}
      enableLabel={false}
      enableGridX
      enableGridY={false}
      theme={chartTheme}
      axisLeft={{ tickSize: 0, tickPadding: 8 }}
      axisBottom={{ legend: 'MTBF, hours', legendPosition: 'middle', legendOffset: 36, format: (v) => formatNumber(Number(v), 0) }}
      layers={['grid', 'axes', 'bars', Whiskers]}
      animate={false}
      tooltip={({ data }) => (
        <ChartTooltip
          title={data.label}
          rows={[
            ['MTBF', formatHours(data.mtbf, 0)],
            [`${confidenceLabel} bounds`, `${formatNumber(data.lower, 0)} – ${data.upper < 0 ? '∞' : formatNumber(data.upper, 0)} h`],
            ['Failures', formatNumber(data.failures, 0)],
          ]}
        />
      )}
    />
  );
}
