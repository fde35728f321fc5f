import { describe, expect, it } from 'vitest';

import { vesselWorkCautions } from '#shared/cautions.ts';
import { forecastQuerySchema, forecastReportSchema } from '#shared/schemas/forecast.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

describe('forecast query', () => {
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
});

describe('forecast answers follow docs/design.md §7', () => {
  it('forecast: months with expected count, cost and band', () => {
    // One month, so the group's total is that month's figures.
    const figures = { expectedCount: 0.4, expectedCost: 248, countLower: 0.2, countUpper: 0.7, costLower: 124, costUpper: 434 };
    const month = { label: '2026-01', from: '2026-01-01T00:00:00.000Z', to: '2026-02-01T00:00:00.000Z', ...figures, partial: false };
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
          total: figures,
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
