import { describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { formatForecast } from '#bin/formatters/forecast.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

const figures = { expectedCount: 0.75, expectedCost: 465, countLower: 0.5, countUpper: 1.25, costLower: 310, costUpper: 775 };
const weibull = { shape: 2.1, scaleDays: 82, shapeLower: 1.6, shapeUpper: 2.7, scaleLowerDays: 70, scaleUpperDays: 96, logLik: -113.7, intervalMethod: 'likelihood-ratio' };
const report = forecastReportSchema.parse({
  ...freshAnswer,
  site: 'FC',
  asOf: '2020-12-31T23:00:00.000Z',
  confidence: 0.9,
  groupBy: 'train',
  currency: 'EUR',
  renewal: false,
  bandMethod: 'range over a confidence region',
  groups: [
    {
      key: 'train=T1',
      inService: 2,
      weibull,
      fitSource: 'group',
      months: [
        { label: '2021-01', from: '2020-12-31T23:00:00.000Z', to: '2021-01-31T23:00:00.000Z', partial: false, ...figures },
        { label: '2021-02', from: '2021-01-31T23:00:00.000Z', to: '2021-02-28T23:00:00.000Z', partial: false, ...figures },
      ],
      total: { expectedCount: 1.5, expectedCost: 930, countLower: 1, countUpper: 2.5, costLower: 620, costUpper: 1550 },
      elements: [],
    },
    {
      key: 'train=T2',
      inService: 1,
      weibull,
      fitSource: 'pooled',
      months: [
        { label: '2021-01', from: '2020-12-31T23:00:00.000Z', to: '2021-01-31T23:00:00.000Z', partial: false, ...figures },
        { label: '2021-02', from: '2021-01-31T23:00:00.000Z', to: '2021-02-28T23:00:00.000Z', partial: false, ...figures, countLower: null, countUpper: null },
      ],
      total: { ...figures, expectedCount: 1.5, expectedCost: 930 },
      elements: [],
    },
  ],
  totals: [
    { label: '2021-01', from: '2020-12-31T23:00:00.000Z', to: '2021-01-31T23:00:00.000Z', expectedCount: 1.5, expectedCost: 930 },
    { label: '2021-02', from: '2021-01-31T23:00:00.000Z', to: '2021-02-28T23:00:00.000Z', expectedCount: 1.5, expectedCost: 930 },
  ],
  inService: 3,
  windowTreatment: { enteredLate: 0, censoredAtEnd: 3, text: 'The forecast covers the 3 element(s) in service at the window’s end.' },
  notes: [],
  cautions: [],
  provenance: { workOrders: [], tags: [], windows: [], elements: ['E-1', 'E-2', 'E-3'], elementCount: 3 },
});

const cells = (line: string) => line.split('│').map((c) => c.trim()).filter(Boolean);

describe('formatForecast', () => {
  const text = formatForecast({ ...report, notes: ['train=T2: its own lives give no Weibull fit (no-events); the pooled fit of every life in scope is used.'] });
  const lines = text.split('\n');

  it('prints month rows with the expected count, its band and the cost in the plant currency', () => {
    expect(text).toMatch(/month.*expected replacements.*90% band.*cost \(EUR\).*cost 90% band \(EUR\)/);
    expect(cells(lines.find((l) => l.includes('2021-01'))!)).toEqual(['2021-01', '0.75', '0.5–1.25', '465', '310–775']);
    expect(cells(lines.find((l) => l.includes('total'))!)).toEqual(['total', '1.5', '1–2.5', '930', '620–1,550']);
  });

  it('shows a band it does not have as a dash, and sums the groups month by month', () => {
    const t2Feb = lines.filter((l) => l.includes('2021-02'))[1]!;
    expect(cells(t2Feb)).toEqual(['2021-02', '0.75', '—', '465', '310–775']);
    expect(text).toContain('All groups:');
    expect(cells(lines.filter((l) => l.includes('2021-02')).at(-1)!)).toEqual(['2021-02', '1.5', '930']);
  });

  it('ends with the notes and the cautions for opening pressure vessels, even when the report’s own list is empty', () => {
    expect(text).toContain('Note: train=T2: its own lives give no Weibull fit');
    for (const caution of vesselWorkCautions) expect(text).toContain(`! ${caution}`);
    expect(formatForecast(report)).toContain(vesselWorkCautions[0]);
  });
});
