import { describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { quantileMethodType7, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { formatTimeToComplete } from '#bin/formatters/time-to-complete.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

// Figures of the ten invented jobs of reference/checks.json: type 7 median 6.75, p90 17.4, mean 9.35.
const report = timeToCompleteReportSchema.parse({
  ...freshAnswer,
  site: 'TTC',
  from: '2021-01-01T00:00:00.000Z',
  to: '2022-01-01T00:00:00.000Z',
  quantileMethod: quantileMethodType7,
  groups: [
    { key: 'all', n: 10, meanHours: 9.35, medianHours: 6.75, p90Hours: 17.4, sdHours: 8.389974176, minHours: 2.5, maxHours: 30 },
    { key: 'guided=yes', n: 6, meanHours: 5.25, medianHours: 5.25, p90Hours: 7.75, sdHours: 2.296736817, minHours: 2.5, maxHours: 8 },
    { key: 'guided=no', n: 0, meanHours: null, medianHours: null, p90Hours: null, sdHours: null, minHours: null, maxHours: null, reason: 'no-jobs' },
  ],
  jobs: [{ woNumber: 'WO-01', startedAt: '2021-01-04T07:00:00.000Z', completedAt: '2021-01-04T11:30:00.000Z', hours: 4.5, guided: true, steps: 2, crew: 'crew-a', procedure: 'element replacement' }],
  skipped: [],
  learningCurve: { byPeriod: [{ label: '2021-Q1', start: '2020-12-31T23:00:00.000Z', end: '2021-03-31T22:00:00.000Z', n: 3, medianHours: 12, meanHours: 15.5 }], bySequence: [] },
  procedureDefinition: 'procedure = kind of job',
  cautions: [...vesselWorkCautions],
  provenance: { workOrders: ['WO-01'], workOrderCount: 10, tags: [], windows: [] },
});

const cells = (line: string) => line.split('│').map((c) => c.trim()).filter(Boolean);

describe('formatTimeToComplete', () => {
  const text = formatTimeToComplete({ ...report, cautions: [...vesselWorkCautions], procedureDefinition: 'procedure = kind of job' });
  const lines = text.split('\n');

  it('prints group rows of n, mean, median and p90 in hours', () => {
    expect(text).toMatch(/group.*n.*mean \(h\).*median \(h\).*p90 \(h\)/);
    expect(cells(lines.find((l) => l.includes('│ all'))!)).toEqual(['all', '10', '9.35', '6.75', '17.4']);
    expect(cells(lines.find((l) => l.includes('guided=no'))!)).toEqual(['guided=no', '0', '—', '—', '—']);
  });

  it('prints the learning curve, the quantile method, the procedure rule and the vessel-work cautions', () => {
    expect(cells(lines.find((l) => l.includes('2021-Q1'))!)).toEqual(['2021-Q1', '3', '12', '15.5']);
    expect(text).toContain('Quantiles: type7 (Hyndman & Fan 1996; R default).');
    expect(text).toContain('Procedure: procedure = kind of job');
    for (const caution of vesselWorkCautions) expect(text).toContain(caution);
  });
});
