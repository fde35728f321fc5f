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

/** Draws each bar's confidence interval as a whisker; an interval without an upper bound ends in an arrow. */
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

/** Powers of ten from 10 up to the first one at or above `max`: the ticks of a logarithmic hours axis. */
function decades(max: number): number[] {
  const out: number[] = [];
  for (let v = 10; v < max * 10; v *= 10) {
    out.push(v);
    if (v >= max) break;
  }
  return out;
}

/**
 * MTBF per asset as horizontal bars, shortest on top, with the confidence bounds as whiskers. MTBF of a
 * plant's assets spans hundreds to tens of thousands of hours, and one-failure bounds span a factor of
 * a hundred, so the axis is logarithmic (a symmetric log, which also takes 0).
 */
export function MtbfChart({ bars, confidenceLabel }: { bars: readonly MtbfBar[]; confidenceLabel: string }) {
  const top = Math.max(...bars.map((b) => Math.max(b.mtbf, b.upper)), 10);
  const ticks = decades(top);
  const max = ticks[ticks.length - 1];
  // nivo's horizontal layout draws the first datum at the bottom: longest first puts the shortest on top.
  const data = [...bars].sort((a, b) => b.mtbf - a.mtbf);
  return (
    <ResponsiveBar<MtbfBar>
      data={data}
      keys={['mtbf']}
      indexBy="label"
      layout="horizontal"
      margin={{ top: 8, right: 24, bottom: 44, left: 104 }}
      padding={0.35}
      valueScale={{ type: 'symlog', constant: 1, min: 0, max, nice: false }}
      colors={[chartColors.primarySoft]}
      borderColor={chartColors.primary}
      borderWidth={1}
      enableLabel={false}
      enableGridX
      gridXValues={ticks}
      enableGridY={false}
      theme={chartTheme}
      axisLeft={{ tickSize: 0, tickPadding: 8 }}
      axisBottom={{ legend: 'MTBF, hours (logarithmic)', legendPosition: 'middle', legendOffset: 36, tickValues: ticks, format: (v) => formatNumber(Number(v), 0) }}
      layers={['grid', 'axes', 'bars', Whiskers]}
      animate={false}
      tooltip={({ data: d }) => (
        <ChartTooltip
          title={d.label}
          rows={[
            ['MTBF', formatHours(d.mtbf, 0)],
            [`${confidenceLabel} bounds`, `${formatNumber(d.lower, 0)} – ${d.upper < 0 ? '∞' : formatNumber(d.upper, 0)} h`],
            ['Failures', formatNumber(d.failures, 0)],
          ]}
        />
      )}
    />
  );
}
