import { describe, expect, it } from 'vitest';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { formatElementLife } from '#bin/formatters/element-life.ts';
import { groupWithoutEvents } from '../../fixtures/element-life.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

// Figures of the Lieblein & Zelen (1956) ball-bearing fit (reference/checks.json), as days. The fields the
// formatter does not print (scale limits, log-likelihood, KM median limits) only complete the answer's shape.
const report = elementLifeReportSchema.parse({
  ...freshAnswer,
  site: 'LZ',
  from: '2020-01-01T00:00:00.000Z',
  to: '2021-01-01T00:00:00.000Z',
  confidence: 0.9,
  groupBy: 'position',
  groups: [
    {
      key: 'position=1',
      n: 23,
      events: 23,
      weibull: { shape: 2.102058875, scaleDays: 81.87833405, shapeLower: 1.55, shapeUpper: 2.71, scaleLowerDays: 68.6, scaleUpperDays: 97.3, logLik: -113.69, intervalMethod: 'likelihood-ratio' },
      b10Days: 28.06941401,
      medianDays: 68.77741335,
      meanDays: 72.51865178,
      enteredLate: 0,
      kmMedianDays: 67.8,
      kmMedianLowerDays: 51.84,
      kmMedianUpperDays: 93.12,
      // First KM step, 1 event of 23 at risk: Greenwood se = S·√(1/(23·22)), log-transformed 90 % bounds S·exp(∓1.645·√(1/(23·22))), upper capped at 1.
      km: [{ tDays: 17.88, survival: 22 / 23, nRisk: 23, nEvents: 1, nCensored: 0, se: (22 / 23) * Math.sqrt(1 / 506), lower: (22 / 23) * Math.exp(-1.645 * Math.sqrt(1 / 506)), upper: 1 }],
      medianRankRegression: null,
      reasons: { medianRankRegression: 'too-few-events' },
    },
    groupWithoutEvents('position=2', 2, { reasons: { weibull: 'no-events' } }),
  ],
  windowTreatment: { enteredLate: 0, censoredAtEnd: 2, text: 'Lives still in service at the window end are censored there.' },
  notes: ['Lives still in service at the window end are censored there.'],
  provenance: { workOrders: [], tags: [], windows: [], elements: [], elementCount: 25 },
});

describe('formatElementLife', () => {
  const text = formatElementLife(report);
  const rows = text.split('\n');

  it('prints one row per group with n, events, shape, scale, B10, median and mean, units in the headers', () => {
    expect(text).toMatch(/shape β.*scale η \(d\).*B10 \(d\).*median \(d\).*mean \(d\)/);
    const row = rows.find((l) => l.includes('position=1'))!;
    const cells = row.split('│').map((c) => c.trim()).filter(Boolean);
    expect(cells).toEqual(['position=1', '23', '23', '2.102', '1.55–2.71', '81.88', '28.07', '68.78', '72.52', '67.8']);
  });

  it('shows a missing fit as dashes and says why', () => {
    const cells = rows.find((l) => l.includes('position=2'))!.split('│').map((c) => c.trim()).filter(Boolean);
    expect(cells.slice(0, 4)).toEqual(['position=2', '2', '0', '—']);
    expect(text).toContain('position=2: no Weibull fit — Every life is censored');
  });

  it('states the window and the grouping', () => {
    expect(rows[0]).toBe('Element life — site LZ, grouped by position, lives in service from 2020-01-01T00:00:00.000Z to 2021-01-01T00:00:00.000Z');
  });

  it('prints how lives crossing the window were treated, and the other notes', () => {
    const withWindow = formatElementLife({
      ...report,
      windowTreatment: { enteredLate: 3, censoredAtEnd: 2, text: 'Three lives began before the window.' },
      notes: ['Three lives began before the window.', 'The regression uses the lives seen from installation.'],
    });
    const lines = withWindow.split('\n');
    expect(lines.filter((l) => l.includes('Three lives began before the window.'))).toHaveLength(1);
    expect(lines).toContain('Note: The regression uses the lives seen from installation.');
    expect(text).toContain('Lives still in service at the window end are censored there.');
  });
});
