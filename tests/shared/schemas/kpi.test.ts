import { describe, expect, it } from 'vitest';

import { fitWeibull, kaplanMeier, weibullLifeStats } from '#shared/kpi/element-life.ts';
import { mtbfWithBounds, mttrHours, inherentAvailability } from '#shared/kpi/reliability.ts';
import { nullReasonMessages, nullReasons } from '#shared/kpi/stats.ts';
import { buildTimeToCompleteReport } from '#shared/kpi/time-to-complete-report.ts';
import { windowQuerySchema } from '#shared/schemas/common.ts';
import { elementLifeQuerySchema, elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastQuerySchema, forecastReportSchema } from '#shared/schemas/forecast.ts';
import { reliabilityQuerySchema, reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { timeToCompleteQuerySchema, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';



describe('window query', () => {
  it('defaults confidence to 0.9 and keeps dates as the raw strings', () => {
    expect(windowQuerySchema.parse({ from: '2025-01-01', to: '2025-07-01T06:00' })).toEqual({
      from: '2025-01-01',
      to: '2025-07-01T06:00',
      confidence: 0.9,
    });
  });
  it('accepts date-times with Z or an offset and coerces a query-string confidence', () => {
    const q = windowQuerySchema.parse({
      site: 'PLANT1',
      asset: 'P-101',
      from: '2025-01-01T00:00:00Z',
      to: '2025-02-01T00:00:00+01:00',
      confidence: '0.95',
    });
    expect(q.confidence).toBe(0.95);
  });
  it.each([
    [{ from: '2025-13-01' }],
    [{ to: '1 March 2025' }],
    [{ confidence: '1' }],
    [{ confidence: '0' }],
    [{ confidence: 'high' }],
    [{ site: '' }],
  ])('refuses %o', (bad) => {
    expect(windowQuerySchema.safeParse(bad).success).toBe(false);
  });
});

describe('endpoint queries', () => {
  it('reliability: groupBy all by default', () => {
    expect(reliabilityQuerySchema.parse({ asset: 'P-101' })).toEqual({
      asset: 'P-101',
      confidence: 0.9,
      groupBy: 'all',
    });
  });
  it('element-life: groupBy all|train|stage|position|model', () => {
    expect(elementLifeQuerySchema.parse({ groupBy: 'position' }).groupBy).toBe('position');
    expect(elementLifeQuerySchema.safeParse({ groupBy: 'colour' }).success).toBe(false);
  });
  it('forecast: 12 months by default, renewal from a query string', () => {
    expect(forecastQuerySchema.parse({})).toMatchObject({
      months: 12,
      renewal: false,
      groupBy: 'all',
      confidence: 0.9,
    });
    expect(forecastQuerySchema.parse({ months: '24', renewal: 'true' })).toMatchObject({ months: 24, renewal: true });
    expect(forecastQuerySchema.safeParse({ months: '0' }).success).toBe(false);
  });
  it('time-to-complete: optional groupBy', () => {
    expect(timeToCompleteQuerySchema.parse({ groupBy: 'crew' }).groupBy).toBe('crew');
  });
});

describe('answers follow docs/design.md §7', () => {
  it('reliability: the documented keys, from the KPI functions', () => {
    const mtbf = mtbfWithBounds({ operatingHours: 8696, failures: 4, confidence: 0.9, terminated: 'time' });
    const mttr = mttrHours([10, 14, 6, 18]);
    const answer = {
      ...freshAnswer,
      asset: 'P-101',
      from: '2025-01-01T00:00:00.000Z',
      to: '2026-01-01T00:00:00.000Z',
      operatingHours: 8696,
      failures: 4,
      mtbfHours: mtbf.mtbfHours,
      mtbfLowerHours: mtbf.lowerHours,
      mtbfUpperHours: mtbf.upperHours,
      mttrHours: mttr.value,
      availability: inherentAvailability(mtbf.mtbfHours, mttr).value,
      confidence: 0.9,
      operatingTimeSource: 'run-status',
      scope: ['P-101'],
      provenance: { workOrders: ['WO-1', 'WO-2', 'WO-3', 'WO-4'], tags: ['P101.RUN'], windows: [] },
    };
    expect(reliabilityReportSchema.parse(answer)).toEqual(answer);
  });

  it('reliability with no failures: nulls with reasons, never NaN', () => {
    const mtbf = mtbfWithBounds({ operatingHours: 800, failures: 0, confidence: 0.9, terminated: 'time' });
    const answer = {
      ...freshAnswer,
      asset: 'P-101',
      from: null,
      to: null,
      operatingHours: 800,
      failures: 0,
      mtbfHours: mtbf.mtbfHours,
      mtbfLowerHours: mtbf.lowerHours,
      mtbfUpperHours: mtbf.upperHours,
      mttrHours: null,
      availability: null,
      confidence: 0.9,
      reasons: { mtbfHours: 'no-failures', mttrHours: 'no-failures', availability: 'no-failures' },
    };
    expect(reliabilityReportSchema.safeParse(answer).success).toBe(true);
    expect(reliabilityReportSchema.safeParse({ ...answer, mtbfHours: Number.NaN }).success).toBe(false);
    expect(reliabilityReportSchema.safeParse({ ...answer, reasons: { mtbfHours: 'because' } }).success).toBe(false);
  });

  it('element-life: groups with weibull, B10/median/mean and the KM curve', () => {
    const times = [400, 650, 800, 820, 900, 1000, 1100, 1300];
    const events = [true, true, false, true, true, false, true, false];
    const fit = fitWeibull(times, events).fit!;
    const life = weibullLifeStats(fit);
    const km = kaplanMeier(times, events, 0.9);
    const answer = {
      ...freshAnswer,
      groups: [
        {
          key: 'position=1',
          n: times.length,
          events: 5,
          weibull: { shape: fit.shape, scaleDays: fit.scale, shapeLower: fit.shapeLower, shapeUpper: fit.shapeUpper },
          b10Days: life.b10,
          medianDays: life.median,
          meanDays: life.mean,
          kmMedianDays: km.median,
          km: km.rows.map((r) => ({ tDays: r.t, survival: r.survival, lower: r.lower, upper: r.upper })),
        },
        {
          key: 'all',
          n: 2,
          events: 0,
          weibull: null,
          b10Days: null,
          medianDays: null,
          meanDays: null,
          km: [{ tDays: 100, survival: 1 }],
          reasons: { weibull: 'no-events' },
        },
      ],
    };
    expect(elementLifeReportSchema.parse(answer)).toEqual(answer);
    expect(elementLifeReportSchema.safeParse({ ...answer, groups: [{ ...answer.groups[1], key: 'colour=red' }] }).success).toBe(
      false,
    );
  });

  it('time-to-complete: quantileMethod, groups and jobs with ISO times', () => {
    const job = { woNumber: 'WO-7', type: 'corrective', crew: null, assetKind: 'pump', guided: true, steps: 2 };
    const result = buildTimeToCompleteReport(
      { site: 'PLANT', timeZone: 'UTC', workOrderExtent: { from: null, to: null }, jobs: [{ ...job, startedAt: new Date('2025-03-01T08:00:00Z'), completedAt: new Date('2025-03-01T11:00:00Z') }] },
      { from: null, to: null },
    );
    const answer = { ...freshAnswer, ...result };
    const parsed = timeToCompleteReportSchema.parse(answer);
    expect(parsed.jobs[0]).toMatchObject({ woNumber: 'WO-7', startedAt: '2025-03-01T08:00:00.000Z', hours: 3, guided: true });
    expect(timeToCompleteReportSchema.safeParse({ ...answer, quantileMethod: 'type 6' }).success).toBe(false);
  });

  it('forecast: months with expected count, cost and band', () => {
    const month = {
      label: '2026-01',
      from: '2026-01-01T00:00:00.000Z',
      to: '2026-02-01T00:00:00.000Z',
      expectedCount: 0.4,
      expectedCost: 248,
      countLower: 0.2,
      countUpper: 0.7,
      costLower: 124,
      costUpper: 434,
    };
    const answer = {
      ...freshAnswer,
      asOf: '2026-01-01T00:00:00.000Z',
      confidence: 0.9,
      groupBy: 'all',
      renewal: false,
      bandMethod: 'range over the likelihood region',
      groups: [
        {
          key: 'all',
          inService: 12,
          weibull: { shape: 2.1, scaleDays: 1500 },
          months: [month],
          total: {
            expectedCount: 0.4,
            expectedCost: 248,
            countLower: 0.2,
            countUpper: 0.7,
            costLower: 124,
            costUpper: 434,
          },
        },
      ],
      totals: [{ label: '2026-01', from: month.from, to: month.to, expectedCount: 0.4, expectedCost: 248 }],
    };
    expect(forecastReportSchema.parse(answer)).toEqual(answer);
  });
});

describe('null reasons', () => {
  it('every reason code has a sentence', () => {
    for (const code of nullReasons) expect(nullReasonMessages[code]).toMatch(/\.$/);
  });
});
