import { describe, expect, it } from 'vitest';

import { fitWeibull, kaplanMeier, weibullLifeStats, weibullMedianRankRegression } from '#shared/kpi/element-life.ts';
import { weibullOut } from '#shared/kpi/element-life-report.ts';
import { elementLifeQuerySchema, elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { groupWithoutEvents } from '../../fixtures/element-life.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

describe('element-life query', () => {
  it('element-life: groupBy all|train|stage|position|model', () => {
    expect(elementLifeQuerySchema.parse({ groupBy: 'position' }).groupBy).toBe('position');
    expect(elementLifeQuerySchema.safeParse({ groupBy: 'colour' }).success).toBe(false);
  });
});

describe('element-life answers follow docs/design.md §7', () => {
  it('element-life: groups with weibull, B10/median/mean and the KM curve', () => {
    const times = [400, 650, 800, 820, 900, 1000, 1100, 1300];
    const events = [true, true, false, true, true, false, true, false];
    const fit = fitWeibull(times, events).fit!;
    const life = weibullLifeStats(fit);
    const km = kaplanMeier(times, events, 0.9);
    const mrr = weibullMedianRankRegression(times, events).fit!;
    const answer = {
      ...freshAnswer,
      groups: [
        {
          key: 'position=1',
          n: times.length,
          events: 5,
          weibull: weibullOut(fit),
          b10Days: life.b10,
          medianDays: life.median,
          meanDays: life.mean,
          enteredLate: 0,
          kmMedianDays: km.median,
          kmMedianLowerDays: km.medianLower,
          kmMedianUpperDays: km.medianUpper,
          km: km.rows.map((r) => ({ tDays: r.t, survival: r.survival, nRisk: r.nRisk, nEvents: r.nEvents, nCensored: r.nCensored, se: r.se, lower: r.lower, upper: r.upper })),
          medianRankRegression: {
            yOnX: { shape: mrr.yOnX.shape, scaleDays: mrr.yOnX.scale },
            xOnY: { shape: mrr.xOnY.shape, scaleDays: mrr.xOnY.scale },
            correlation: mrr.correlation,
          },
        },
        groupWithoutEvents('all', 2, {
          km: [{ tDays: 100, survival: 1, nRisk: 2, nEvents: 0, nCensored: 2, se: 0, lower: 1, upper: 1 }],
          reasons: { weibull: 'no-events', kmMedianDays: 'not-reached' },
        }),
      ],
      site: 'PLANT',
      from: '2025-01-01T00:00:00.000Z',
      to: '2029-01-01T00:00:00.000Z',
      confidence: 0.9,
      groupBy: 'position',
      windowTreatment: { enteredLate: 0, censoredAtEnd: 5, text: 'Every element life in the window (10) is observed from its installation.' },
      notes: ['Every element life in the window (10) is observed from its installation.'],
      provenance: { workOrders: [], tags: [], windows: [], elements: Array.from({ length: 10 }, (_, i) => `E-${i + 1}`), elementCount: 10 },
    };
    expect(elementLifeReportSchema.parse(answer)).toEqual(answer);
    // An element answer names the serials it used, and how many there were.
    expect(elementLifeReportSchema.safeParse({ ...answer, provenance: { workOrders: [], tags: [], windows: [] } }).success).toBe(false);
    expect(elementLifeReportSchema.safeParse({ ...answer, groups: [{ ...answer.groups[1], key: 'colour=red' }] }).success).toBe(
      false,
    );
  });

});
