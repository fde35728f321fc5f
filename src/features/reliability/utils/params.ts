import { reliabilityGroupByValues } from '#shared/schemas/reliability.ts';
import { readChoice, readKpiWindow } from '../../../lib/kpi-window.ts';
import type { ReliabilityParams } from '../api/get-reliability.ts';

/** The reliability page's question from its address; per asset unless the address says otherwise. */
export function reliabilityParams(search: URLSearchParams, plantConfidence: number): ReliabilityParams {
  const w = readKpiWindow(search);
  return { ...w, confidence: w.confidence ?? plantConfidence, groupBy: readChoice(search, 'groupBy', reliabilityGroupByValues, 'asset') };
}
