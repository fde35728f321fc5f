import type { ElementLifeReport } from '#shared/schemas/element-life.ts';

type KmPoint = ElementLifeReport['groups'][number]['km'][number];

export interface SurvivalStep {
  tDays: number;
  survival: number;
  lower: number | null;
  upper: number | null;
}

/**
 * The Kaplan–Meier curve as the steps a chart needs: it starts at (0, 1), keeps a point where the
 * survival estimate has fallen by at least `minDrop` since the last one kept (censoring alone changes
 * nothing on the curve), and always keeps the last point. Display only: the table keeps the exact figures.
 */
export function survivalSteps(km: readonly KmPoint[], minDrop = 0.002): SurvivalStep[] {
  const steps: SurvivalStep[] = [{ tDays: 0, survival: 1, lower: 1, upper: 1 }];
  for (const p of km) {
    const last = steps[steps.length - 1];
    if (last.survival - p.survival >= minDrop) steps.push({ tDays: p.tDays, survival: p.survival, lower: p.lower ?? null, upper: p.upper ?? null });
  }
  const final = km[km.length - 1];
  if (final && steps[steps.length - 1].tDays < final.tDays) {
    steps.push({ tDays: final.tDays, survival: final.survival, lower: final.lower ?? null, upper: final.upper ?? null });
  }
  return steps;
}
