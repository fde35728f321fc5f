// A new plant imported file by file with the CLI, then every historian KPI asked straight away, with no
// `osmia refresh` in between: the answers count the new data (issue: fresh data is never silently missing).
// The plant is ops-plant.ts's, plus a run-status tag on TR1's high-pressure pump, which stops with the train
// on Jan 3 (06:00–18:00) and once on its own on Jan 9 (10:00–14:00) while the train runs.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRecordSchema } from '#shared/schemas/imports.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { createTestDatabase, type TestDatabase } from '../setup/db.ts';
import { fileWith } from '../server/importers/helpers.ts';
import { assetsCsv, elementsCsv, historianCsv, tagsCsv, workOrdersCsv } from '../fixtures/ops-plant.ts';
import { runCli } from '../setup/cli.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
});
afterAll(() => t.close());

const cli = (...args: string[]) => runCli(t.url, args);

const H = 3_600_000;
function pumpHistorian(): string {
  const lines = ['timestamp,tag,value,quality'];
  const stopped = (ms: number) =>
    (ms >= Date.parse('2025-01-03T06:00:00Z') && ms < Date.parse('2025-01-03T18:00:00Z')) || (ms >= Date.parse('2025-01-09T10:00:00Z') && ms < Date.parse('2025-01-09T14:00:00Z'));
  for (let ms = Date.UTC(2025, 0, 1); ms <= Date.UTC(2025, 0, 11); ms += H) lines.push(`${new Date(ms).toISOString()},TR1-HPP.RUN,${stopped(ms) ? 0 : 1},good`);
  return lines.join('\n') + '\n';
}

describe('import with the CLI, then ask at once', () => {
  it('imports every file with 0 rejects and says each brought derived data up to date', () => {
    const files: [string, string][] = [
      ['assets', assetsCsv],
      ['tags', tagsCsv + '\nTR1-HPP.RUN,TR1-HPP,run_status,'],
      ['historian', historianCsv()],
      ['historian', pumpHistorian()],
      ['work-orders', workOrdersCsv],
      ['elements', elementsCsv],
    ];
    for (const [kind, csv] of files) {
      const r = cli('import', kind, fileWith(csv, `${kind}.csv`), '--site', 'FRESH', '--tz', 'UTC', '--json');
      expect(r.code, r.err).toBe(0);
      expect(importRecordSchema.parse(JSON.parse(r.out))).toMatchObject({ status: 'completed', rowsRejected: 0, derivedRefreshed: true });
    }
  });

  it('downtime counts the stops, the pump stopping with its train once, and totals that add up', () => {
    const r = cli('kpi', 'downtime', '--asset', 'TR1', '--json');
    expect(r.code).toBe(0);
    expect(r.err).not.toMatch(/Warning/);
    const report = downtimeReportSchema.parse(JSON.parse(r.out));
    expect(report).toMatchObject({ derivedUpToDate: true, warnings: [], dataAsOf: { newestSampleAt: '2025-01-11T00:00:00.000Z' } });
    expect(report.events.map((e) => [e.asset, e.from, e.hours, e.alsoStopped])).toEqual([
      ['TR1', '2025-01-03T06:00:00.000Z', 12, ['TR1-HPP']],
      ['TR1', '2025-01-07T00:00:00.000Z', 8, []],
      ['TR1-HPP', '2025-01-09T10:00:00.000Z', 4, []],
    ]);
    // 12 + 8 + 4 = 24 h at TR1's rated 100 m³/h (the pump has none of its own): 2,400 m³.
    expect(report.plant).toMatchObject({ events: 3, hours: 24, lostVolumeM3: 2400 });
    expect(report.totals.reduce((a, x) => a + x.hours, 0)).toBe(24);
    expect(report.paretoByCause.reduce((a, x) => a + x.hours, 0)).toBe(24);
  });

  it('performance has points and a baseline for both stages of TR1', () => {
    const r = cli('kpi', 'performance', '--asset', 'TR1', '--json');
    expect(r.code).toBe(0);
    const report = performanceReportSchema.parse(JSON.parse(r.out));
    const byStage = new Map(report.stages.map((s) => [s.asset, s]));
    for (const code of ['TR1-S1', 'TR1-S2']) {
      const stage = byStage.get(code)!;
      expect(stage.points.length, code).toBeGreaterThan(5);
      expect(stage.baseline, code).not.toBeNull();
    }
    expect(report.derivedUpToDate).toBe(true);
  });

  it('reliability takes operating time from run status, and maintenance mix the produced volume', () => {
    const rel = reliabilityReportSchema.parse(JSON.parse(cli('kpi', 'reliability', '--asset', 'TR1', '--json').out));
    // 240 h of data less the train's 12 h + 8 h of stops.
    expect(rel).toMatchObject({ operatingTimeSource: 'run-status', operatingHours: 220 });
    const mix = maintenanceMixReportSchema.parse(JSON.parse(cli('kpi', 'maintenance-mix', '--asset', 'TR1', '--json').out));
    expect(mix.cost.producedM3).toBeGreaterThan(0);
  });

  it('with --no-refresh the record says so, the summary says what to run, and the next KPI catches up', () => {
    const day = 'timestamp,tag,value,quality\n2025-01-11T01:00:00Z,TR1.RUN,0,good\n2025-01-11T05:00:00Z,TR1.RUN,1,good\n';
    const json = cli('import', 'historian', fileWith(day, 'day.csv'), '--no-refresh', '--json');
    expect(json.code).toBe(0);
    expect(importRecordSchema.parse(JSON.parse(json.out)).derivedRefreshed).toBe(false);
    const table = cli('import', 'historian', fileWith(day.replace('TR1.RUN,1', 'TR1.RUN,1.0'), 'day2.csv'), '--no-refresh');
    expect(table.out).toMatch(/run "bin\/osmia refresh"/);
    // A few tag-hours waiting: the KPI rebuilds them before answering, so the new stop is in the answer.
    const report = downtimeReportSchema.parse(JSON.parse(cli('kpi', 'downtime', '--asset', 'TR1', '--json').out));
    expect(report.derivedUpToDate).toBe(true);
    expect(report.events.at(-1)).toMatchObject({ asset: 'TR1', from: '2025-01-11T01:00:00.000Z', hours: 4 });
  });
});
