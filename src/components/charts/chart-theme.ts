import type { BarSvgProps } from '@nivo/bar';

// One look for every chart, from the palette of tailwind.config.ts. Type-only import: this file
// adds nothing of nivo to the chunk that imports it; the charts themselves are loaded on demand.

type ChartTheme = NonNullable<BarSvgProps<Record<string, string | number>>['theme']>;

/** Series colours in order: tide, sand, kelp, ember, light tide, basin, dark sand, dark kelp. */
export const seriesColors = ['#1a677d', '#b7791f', '#3f8a4b', '#c8473a', '#3f9bb2', '#62808b', '#784c17', '#285b31'] as const;

export const chartColors = {
  primary: '#1a677d',
  primarySoft: '#a9d8e3',
  caution: '#b7791f',
  cautionSoft: '#f2d98f',
  fault: '#c8473a',
  ok: '#3f8a4b',
  ink: '#2e3b42',
  muted: '#62808b',
  grid: '#e9eff1',
} as const;

export const chartTheme: ChartTheme = {
  background: 'transparent',
  text: { fontFamily: '"Fira Sans", system-ui, sans-serif', fontSize: 12, fill: '#40555e' },
  axis: {
    domain: { line: { stroke: '#b0c2c9', strokeWidth: 1 } },
    ticks: { line: { stroke: '#b0c2c9', strokeWidth: 1 }, text: { fontSize: 11, fill: '#4d6873' } },
    legend: { text: { fontSize: 12, fontWeight: 700, fill: '#37474f' } },
  },
  grid: { line: { stroke: '#e9eff1', strokeWidth: 1 } },
  legends: { text: { fontSize: 12, fill: '#37474f' } },
  crosshair: { line: { stroke: '#37474f', strokeWidth: 1, strokeOpacity: 0.5 } },
  tooltip: {
    container: {
      background: '#ffffff',
      color: '#2e3b42',
      fontSize: 12,
      borderRadius: 6,
      border: '1px solid #d3dee2',
      boxShadow: '0 4px 12px rgba(27, 37, 42, 0.12)',
      padding: '6px 10px',
    },
  },
  markers: { lineColor: '#62808b', lineStrokeWidth: 1 },
};
