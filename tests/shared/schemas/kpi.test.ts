import { describe, expect, it } from 'vitest';

import { vesselWorkCautions } from '#shared/cautions.ts';
import { fitWeibull, kaplanMeier, weibullLifeStats, weibullMedianRankRegression } from '#shared/kpi/element-life.ts';
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
      site: 'PLANT',
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
      operationalAvailability: 8696 / 8760,
      meanActiveRepairHours: 8,
      confidence: 0.9,
      sides: 'two-sided',
      terminated: 'time',
      operatingTimeSource: 'run-status',
      scope: ['P-101'],
      reasons: {},
      // 2025 has 8760 h; 64 h stopped.
      operatingTime: { windowHours: 8760, uptimeHours: 8696, downtimeHours: 64, unknownHours: 0, units: [{ asset: 'P-101', source: 'run-status', tag: 'P101.RUN', hours: 8696 }] },
      mttrBasis: { outOfServiceWindow: 4, completedLessReported: 0, unknown: 0 },
      notes: [],
      groups: [],
      provenance: { workOrders: ['WO-1', 'WO-2', 'WO-3', 'WO-4'], tags: ['P101.RUN'], windows: [] },
    };
    expect(reliabilityReportSchema.parse(answer)).toEqual(answer);
    // Every answer carries its provenance and how its operating time was made up.
    expect(reliabilityReportSchema.safeParse({ ...answer, provenance: undefined }).success).toBe(false);
    expect(reliabilityReportSchema.safeParse({ ...answer, groups: [{ key: 'asset=P-101', asset: 'P-101', operatingHours: 8696, failures: 4 }] }).success).toBe(false);
  });

  it('reliability with no failures: nulls with reasons, never NaN', () => {
    const mtbf = mtbfWithBounds({ operatingHours: 800, failures: 0, confidence: 0.9, terminated: 'time' });
    const answer = {
      ...freshAnswer,
      site: 'PLANT',
      asset: 'P-101',
      from: '2025-01-01T00:00:00.000Z',
      to: '2025-02-03T08:00:00.000Z',
      operatingHours: 800,
      failures: 0,
      mtbfHours: mtbf.mtbfHours,
      mtbfLowerHours: mtbf.lowerHours,
      mtbfUpperHours: mtbf.upperHours,
      mttrHours: null,
      availability: null,
      operationalAvailability: 1,
      meanActiveRepairHours: null,
      confidence: 0.9,
      sides: 'two-sided',
      terminated: 'time',
      operatingTimeSource: 'run-status',
      scope: ['P-101'],
      reasons: { mtbfHours: 'no-failures', mttrHours: 'no-failures', availability: 'no-failures', meanActiveRepairHours: 'no-repairs' },
      operatingTime: { windowHours: 800, uptimeHours: 800, downtimeHours: 0, unknownHours: 0, units: [{ asset: 'P-101', source: 'run-status', tag: 'P101.RUN', hours: 800 }] },
      mttrBasis: { outOfServiceWindow: 0, completedLessReported: 0, unknown: 0 },
      notes: [],
      groups: [],
      provenance: { workOrders: [], tags: ['P101.RUN'], windows: [] },
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
    const mrr = weibullMedianRankRegression(times, events).fit!;
    const answer = {
      ...freshAnswer,
      groups: [
        {
          key: 'position=1',
          n: times.length,
          events: 5,
          weibull: {
            shape: fit.shape,
            scaleDays: fit.scale,
            shapeLower: fit.shapeLower,
            shapeUpper: fit.shapeUpper,
            scaleLowerDays: fit.scaleLower,
            scaleUpperDays: fit.scaleUpper,
            logLik: fit.logLik,
            intervalMethod: fit.intervalMethod,
          },
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
        {
          key: 'all',
          n: 2,
          events: 0,
          enteredLate: 0,
          weibull: null,
          b10Days: null,
          medianDays: null,
          meanDays: null,
          kmMedianDays: null,
          kmMedianLowerDays: null,
          kmMedianUpperDays: null,
          km: [{ tDays: 100, survival: 1, nRisk: 2, nEvents: 0, nCensored: 2, se: 0, lower: 1, upper: 1 }],
          medianRankRegression: null,
          reasons: { weibull: 'no-events', kmMedianDays: 'not-reached' },
        },
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
      partial: false,
    };
    const answer = {
      ...freshAnswer,
      site: 'PLANT',
      currency: 'EUR',
      asOf: '2026-01-01T00:00:00.000Z',
      confidence: 0.9,
      groupBy: 'all',
      renewal: false,
      bandMethod: 'range over the likelihood region',
      groups: [
        {
          key: 'all',
          inService: 12,
          weibull: { shape: 2.1, scaleDays: 1500, shapeLower: 1.4, shapeUpper: 3, scaleLowerDays: 1200, scaleUpperDays: 1900, logLik: -61.2, intervalMethod: 'likelihood-ratio' },
          fitSource: 'group',
          months: [month],
          total: {
            expectedCount: 0.4,
            expectedCost: 248,
            countLower: 0.2,
            countUpper: 0.7,
            costLower: 124,
            costUpper: 434,
          },
          elements: [{ serial: 'E-7', ageDays: 1400, probability: 0.08 }],
        },
      ],
      totals: [{ label: '2026-01', from: month.from, to: month.to, expectedCount: 0.4, expectedCost: 248 }],
      inService: 12,
      windowTreatment: { enteredLate: 0, censoredAtEnd: 12, text: 'The forecast covers the 12 element(s) in service at the window’s end.' },
      notes: [],
      cautions: [...vesselWorkCautions],
      provenance: { workOrders: [], tags: [], windows: [], elements: ['E-7'], elementCount: 12 },
    };
    expect(forecastReportSchema.parse(answer)).toEqual(answer);
    // A group says whose fit it used: its own or the pooled one, nothing else.
    expect(forecastReportSchema.safeParse({ ...answer, groups: [{ ...answer.groups[0], fitSource: 'own' }] }).success).toBe(false);
  });
});

describe('null reasons', () => {
  it('every reason code has a sentence', () => {
    for (const code of nullReasons) expect(nullReasonMessages[code]).toMatch(/\.$/);
  });
});
