import type { PerformanceReport } from '#shared/schemas/performance.ts';

export type PerformanceAlert = PerformanceReport['stages'][number]['alerts'][number];

export const alertKindLabels: Record<PerformanceAlert['kind'], string> = {
  'permeate-flow-drop': 'Normalized permeate flow dropped',
  'differential-pressure-rise': 'Normalized differential pressure rose',
  'salt-passage-rise': 'Normalized salt passage rose',
};

export const unitLabels: Record<PerformanceAlert['unit'], string> = { 'm3/h': 'm³/h', '%': '%', bar: 'bar' };

/** Every alert of the answer with the stage it belongs to, most recent first. */
export function allAlerts(report: PerformanceReport): (PerformanceAlert & { stage: string; train: string | null })[] {
  return report.stages
    .flatMap((s) => s.alerts.map((a) => ({ ...a, stage: s.asset, train: s.train ?? null })))
    .sort((a, b) => b.time.localeCompare(a.time));
}
