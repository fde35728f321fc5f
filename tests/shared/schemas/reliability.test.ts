import { describe, expect, it } from 'vitest';

import { mtbfWithBounds, mttrHours, inherentAvailability } from '#shared/kpi/reliability.ts';
import { reliabilityQuerySchema, reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

describe('reliability query', () => {
  it('reliability: groupBy all by default', () => {
    expect(reliabilityQuerySchema.parse({ asset: 'P-101' })).toEqual({
      asset: 'P-101',
      confidence: 0.9,
      groupBy: 'all',
    });
  });
});

describe('reliability answers follow docs/design.md §7', () => {
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

});
