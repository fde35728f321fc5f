import { describe, expect, it } from 'vitest';
import { maintenanceCautions } from '#shared/cautions.ts';
import { normalizePerformance, type PerformancePoint } from '#shared/kpi/performance.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { formatPerformance, TREND_DAYS } from '#bin/formatters/performance.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

// Ten days of a stage whose permeate flow drops 12 % at equal recovery, pressures and temperature from day 6:
// with recovery, NDP and TCF unchanged, the normalized change is the raw change, −12 % (hand-worked).
const base = { pf: 12, pc: 11, pp: 0.5, qf: 40, qp: 10, cf: 1000, cp: 10, tempC: 20 };
const points: PerformancePoint[] = Array.from({ length: 10 }, (_, i) => ({
  ...base,
  time: new Date(Date.UTC(2025, 0, 1 + i)),
  ...(i >= 5 ? { qp: 8.8, qf: 35.2 } : {}),
}));
const result = normalizePerformance(points);
const report = performanceReportSchema.parse({
  ...freshAnswer,
  site: 'OPS',
  from: '2025-01-01T00:00:00.000Z',
  to: '2025-01-11T00:00:00.000Z',
  stages: [
    {
      asset: 'TR1-S2',
      train: 'TR1',
      ...result,
      points: result.points.map((p) => ({ ...p, runningHours: 24 })),
      resets: [],
      runStatusTag: 'TR1.RUN',
      tags: ['TR1.RUN'],
      missingQuantities: [],
      reason: null,
    },
    {
      asset: 'TR2-S1',
      train: 'TR2',
      baseline: null,
      points: [],
      latest: null,
      alerts: [],
      settings: result.settings,
      notes: [],
      resets: [],
      runStatusTag: null,
      tags: [],
      missingQuantities: ['feed_flow', 'permeate_flow'],
      reason: null,
    },
  ],
  notes: [],
  provenance: { workOrders: [], tags: ['TR1.RUN'], windows: [], elements: [] },
});
const withReason = {
  ...report,
  stages: [report.stages[0]!, { ...report.stages[1]!, reason: 'TR2-S1 has no tag for feed_flow, permeate_flow: no normalized figures.' }],
};

describe('formatPerformance', () => {
  const text = formatPerformance(withReason);
  const lines = text.split('\n');

  it('gives the baseline and the latest normalized figures against it, units in the headers', () => {
    expect(text).toContain('Stage TR1-S2 (train TR1)');
    expect(text).toContain('Baseline 2025-01-01: first day of running data.');
    const flow = lines.find((l) => l.startsWith('│ permeate flow (m³/h)'))!;
    const cells = flow.split('│').map((c) => c.trim()).filter(Boolean);
    expect(cells).toEqual(['permeate flow (m³/h)', '10', '8.8', '-12.0 %']);
  });

  it(`prints the last ${TREND_DAYS} days of the trend`, () => {
    expect(lines.filter((l) => /│ 2025-01-\d\d/.test(l))).toHaveLength(TREND_DAYS);
    expect(text).not.toMatch(/│ 2025-01-03/);
  });

  it('prints the alert with its recommendation and every caution', () => {
    expect(text).toContain('ALERT permeate-flow-drop since 2025-01-06 (threshold 10 %): Normalized permeate flow is 12.0 % below the baseline.');
    expect(text).toContain(result.alerts[0]!.recommendation);
    for (const caution of maintenanceCautions) expect(text).toContain(`! ${caution}`);
  });

  it('says why a stage has no figures', () => {
    expect(text).toContain('Stage TR2-S1 (train TR2)');
    expect(text).toContain('No figures: TR2-S1 has no tag for feed_flow, permeate_flow: no normalized figures.');
  });

  it('prints no cautions when there is no alert', () => {
    const quiet = formatPerformance({ ...report, stages: [{ ...report.stages[0]!, alerts: [] }] });
    expect(quiet).not.toContain('!');
  });
});
