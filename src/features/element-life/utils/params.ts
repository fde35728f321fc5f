import { elementGroupByValues } from '#shared/schemas/element-life.ts';
import { readChoice, readKpiWindow } from '../../../lib/kpi-window.ts';
import type { ElementLifeParams } from '../api/get-element-life.ts';

/** The element-life page's question from its address. */
export function elementLifeParams(search: URLSearchParams, plantConfidence: number): ElementLifeParams {
  const w = readKpiWindow(search);
  return { ...w, confidence: w.confidence ?? plantConfidence, groupBy: readChoice(search, 'groupBy', elementGroupByValues, 'all') };
}

export const groupByLabels: Record<ElementLifeParams['groupBy'], string> = {
  all: 'All elements',
  train: 'Train',
  stage: 'Stage',
  position: 'Position in the vessel',
  model: 'Element model',
};

/** A group key on screen: `all` → "All elements", `position=1` → "Position 1", `stage=T1-S1` → "T1-S1". */
export function groupKeyLabel(key: string): string {
  if (key === 'all') return 'All elements';
  const [kind, ...rest] = key.split('=');
  const value = rest.join('=');
  return kind === 'position' ? `Position ${value}` : value;
}

const daysPerYear = 365.25;

/** Days as years with one decimal, for the axis and the tooltip beside the days. */
export function daysToYears(days: number): number {
  return days / daysPerYear;
}
