import { describe, expect, it } from 'vitest';
import { downtimeReport } from '#shared/kpi/downtime.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { formatDowntime, MAX_EVENT_ROWS } from '#bin/formatters/downtime.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

const cells = (line: string) => line.split('│').map((c) => c.trim()).filter(Boolean);
const t = (iso: string) => new Date(iso);

// Two stops of a train rated 100 m³/h at 0.85 per m³: 12 h unplanned (SEAL-LEAK) and 8 h planned (hand-worked:
// 1200 m³ and 1020, 800 m³ and 680).
const result = downtimeReport({
  window: { from: t('2025-01-01T00:00:00Z'), to: t('2025-01-11T00:00:00Z') },
  assetTree: [
    { code: 'TR1', parent: null },
    { code: 'TR1-S1', parent: 'TR1' },
  ],
  assets: [
    {
      asset: 'TR1',
      ratedPermeateM3h: 100,
      runStatusTag: 'TR1.RUN',
      samples: [
        { time: t('2025-01-01T00:00:00Z'), value: 1 },
        { time: t('2025-01-03T06:00:00Z'), value: 0 },
        { time: t('2025-01-03T18:00:00Z'), value: 1 },
        { time: t('2025-01-07T00:00:00Z'), value: 0 },
        { time: t('2025-01-07T08:00:00Z'), value: 1 },
      ],
    },
  ],
  workOrders: [
    { woNumber: 'WO-1', asset: 'TR1', type: 'corrective', status: 'closed', failureCode: 'SEAL-LEAK', outOfServiceFrom: t('2025-01-03T06:00:00Z'), outOfServiceTo: t('2025-01-03T18:00:00Z') },
    { woNumber: 'WO-4', asset: 'TR1-S1', type: 'preventive', status: 'closed', failureCode: null, outOfServiceFrom: t('2025-01-07T00:00:00Z'), outOfServiceTo: t('2025-01-07T08:00:00Z') },
  ],
  settings: { waterValuePerM3: 0.85 },
});
const report = { ...downtimeReportSchema.parse({
  ...freshAnswer, ...result, site: 'OPS', currency: 'EUR', provenance: { workOrders: ['WO-1', 'WO-4'], tags: ['TR1.RUN'], windows: [] } }), totals: result.totals.map((r) => ({ ...r, ratedPermeateFrom: 'TR1' })) };

describe('formatDowntime', () => {
  const text = formatDowntime(report);
  const lines = text.split('\n');

  it('heads the report with the window and the water value', () => {
    expect(lines[0]).toBe('Downtime — site OPS, 2025-01-01T00:00:00.000Z to 2025-01-11T00:00:00.000Z; water value 0.85 EUR/m³');
  });

  it('prints each stop with hours, planned or not, cause, lost volume and cost, units in the headers', () => {
    expect(text).toMatch(/hours \(h\).*planned.*cause.*lost volume \(m³\).*cost \(EUR\)/);
    expect(cells(lines.find((l) => l.includes('SEAL-LEAK (WO-1)'))!)).toEqual(['TR1', '2025-01-03T06:00:00.000Z', '2025-01-03T18:00:00.000Z', '12', 'no', 'SEAL-LEAK (WO-1)', '1,200', '1,020']);
    expect(cells(lines.find((l) => l.includes('yes (WO-4)'))!)).toEqual(['TR1', '2025-01-07T00:00:00.000Z', '2025-01-07T08:00:00.000Z', '8', 'yes (WO-4)', 'unknown', '800', '680']);
  });

  it('totals each asset and ranks causes', () => {
    const total = lines.slice(lines.indexOf('Totals per asset:')).find((l) => l.includes('│ TR1'))!;
    expect(cells(total)).toEqual(['TR1', '2', '20', '8', '12', '100', '2,000', '1,700']);
    const pareto = lines.slice(lines.indexOf('Pareto by cause:'));
    expect(cells(pareto.find((l) => l.includes('SEAL-LEAK'))!)).toEqual(['SEAL-LEAK', '1', '12', '60 %', '60 %', '1,200', '1,020']);
    expect(cells(pareto.find((l) => l.includes('unknown'))!)).toEqual(['unknown', '1', '8', '40 %', '100 %', '800', '680']);
  });

  it('names the asset whose rating was borrowed', () => {
    const borrowed = formatDowntime({ ...report, totals: report.totals.map((r) => ({ ...r, ratedPermeateFrom: 'PLANT' })) });
    expect(borrowed).toContain('100 (of PLANT)');
  });

  it(`prints at most ${MAX_EVENT_ROWS} stops and counts the rest`, () => {
    const many = { ...report, events: Array.from({ length: MAX_EVENT_ROWS + 3 }, () => report.events[0]!) };
    const out = formatDowntime(many);
    expect(out.split('\n').filter((l) => l.includes('SEAL-LEAK (WO-1)'))).toHaveLength(MAX_EVENT_ROWS);
    expect(out).toContain('… and 3 more stop(s): use --json for all.');
  });

  it('says when there are no stops', () => {
    expect(formatDowntime({ ...report, events: [], totals: [], paretoByAsset: [], paretoByCause: [] })).toContain('No stops in the window.');
  });
});
