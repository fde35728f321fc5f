import { describe, expect, it } from 'vitest';
import { nullReasonMessages } from '#shared/kpi/stats.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { formatReliability } from '#bin/formatters/reliability.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

const cells = (line: string) => line.split('│').map((c) => c.trim()).filter(Boolean);

// Figures of the pump of tests/server/services/reliability.test.ts: T = 220 h, r = 2 (hand-worked there).
/** A group running 220 h of a 240 h window on its train's run status (the fields every group carries). */
const group = (asset: string, scope: string[]) => ({
  asset,
  operatingHours: 220,
  operationalAvailability: 220 / 240,
  meanActiveRepairHours: null,
  scope,
  operatingTimeSource: 'ancestor-run-status',
  reasons: {},
  operatingTime: { windowHours: 240, uptimeHours: 220, downtimeHours: 20, unknownHours: 0, units: [{ asset, source: 'ancestor-run-status', tag: 'TR1.RUN', hours: 220 }] },
  mttrBasis: { outOfServiceWindow: 0, completedLessReported: 0, unknown: 0 },
  notes: [],
});
const report = {
  ...reliabilityReportSchema.parse({
  ...freshAnswer,
    site: 'OPS',
    asset: 'TR1',
    from: '2025-01-01T00:00:00.000Z',
    to: '2025-01-11T00:00:00.000Z',
    confidence: 0.9,
    sides: 'two-sided',
    terminated: 'time',
    operatingHours: 220,
    failures: 2,
    mtbfHours: 110,
    mtbfLowerHours: 34.94396627546779,
    mtbfUpperHours: 619.0878679220688,
    mttrHours: 9,
    availability: 110 / 119,
    operationalAvailability: 220 / 240,
    meanActiveRepairHours: 6,
    scope: ['TR1', 'TR1-S1', 'TR1-HPP'],
    operatingTimeSource: 'run-status',
    reasons: {},
    operatingTime: { windowHours: 240, uptimeHours: 220, downtimeHours: 20, unknownHours: 0, units: [{ asset: 'TR1', source: 'run-status', tag: 'TR1.RUN', hours: 220 }] },
    mttrBasis: { outOfServiceWindow: 1, completedLessReported: 1, unknown: 0 },
    notes: [],
    groups: [
      { key: 'asset=TR1-HPP', ...group('TR1-HPP', ['TR1-HPP']), failures: 2, mtbfHours: 110, mtbfLowerHours: 34.94, mtbfUpperHours: 619.09, mttrHours: 9, availability: 110 / 119, meanActiveRepairHours: 6, mttrBasis: { outOfServiceWindow: 1, completedLessReported: 1, unknown: 0 } },
      { key: 'asset=TR1-S1', ...group('TR1-S1', ['TR1-S1']), failures: 0, mtbfHours: null, mtbfLowerHours: 73.44, mtbfUpperHours: null, mttrHours: null, availability: null, reasons: { mtbfHours: 'no-failures' } },
    ],
    provenance: { workOrders: ['WO-1', 'WO-2'], tags: ['TR1.RUN'], windows: [] },
  }),
  notes: ['1 of 2 failure(s) have no out-of-service window: their restoration time is completed − reported.'],
};

describe('formatReliability', () => {
  const text = formatReliability(report);
  const lines = text.split('\n');

  it('heads the report with the site, the asset, its scope and the window, and the source of operating time', () => {
    expect(lines[0]).toBe('Reliability — site OPS, asset TR1 and the 2 asset(s) below it, 2025-01-01T00:00:00.000Z to 2025-01-11T00:00:00.000Z');
    expect(text).toContain("Operating time from the asset's run-status tag.");
  });

  it('prints each figure with its unit, availabilities as percentages', () => {
    expect(cells(lines.find((l) => l.includes('MTBF (h)'))!)).toEqual(['MTBF (h)', '110']);
    expect(cells(lines.find((l) => l.includes('MTBF lower bound, 90 % (h)'))!)).toEqual(['MTBF lower bound, 90 % (h)', '34.94']);
    expect(cells(lines.find((l) => l.includes('MTBF upper bound'))!)).toEqual(['MTBF upper bound, 90 % (h)', '619.09']);
    expect(cells(lines.find((l) => l.includes('availability, inherent'))!)).toEqual(['availability, inherent', '92.4 %']);
    expect(cells(lines.find((l) => l.includes('operational availability'))!)).toEqual(['operational availability', '91.7 %']);
    expect(text).toContain('NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1');
  });

  it('prints one row per group, missing figures as dashes', () => {
    expect(cells(lines.find((l) => l.includes('asset=TR1-S1'))!)).toEqual(['asset=TR1-S1', 'ancestor-run-status', '220', '0', '—', '73.44', '—', '—', '—']);
  });

  it('says why a figure is missing, and prints the notes', () => {
    const none = formatReliability({ ...report, failures: 0, mtbfHours: null, mtbfUpperHours: null, reasons: { mtbfHours: 'no-failures', mtbfUpperHours: 'no-failures' }, groups: [] });
    const row = none.split('\n').find((l) => l.includes('MTBF (h)'))!;
    expect(row).toContain('—');
    expect(none).toContain(nullReasonMessages['no-failures'].slice(0, 30));
    expect(text).toContain('Note: 1 of 2 failure(s) have no out-of-service window');
  });

  it('says when there is no window', () => {
    expect(formatReliability({ ...report, from: null, to: null }).split('\n')[0]).toMatch(/no data to bound a window$/);
  });
});
