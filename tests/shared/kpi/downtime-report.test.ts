// buildDowntimeReport (shared/kpi/downtime-report.ts) on a hand-worked invented train, without a database.
// Rules: docs/design.md §6 (Downtime: stops, one stop one place, planned, cause, lost volume and cost; Operating
// time: a state holds until the next good sample) and §7 (keys). Pareto shares = hours / total hours (common practice).
import { describe, expect, it } from 'vitest';
import { buildDowntimeReport, type DowntimeAsset, type DowntimeReportInput, type DowntimeTag } from '#shared/kpi/downtime-report.ts';
import type { DowntimeWorkOrder } from '#shared/kpi/downtime.ts';
import type { RunStatusRows } from '#shared/kpi/run-status.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';

const t = (iso: string) => new Date(iso);
const settings = { currency: 'EUR', waterValuePerM3: 0.5 };
const day = { from: t('2025-03-01T00:00:00Z'), to: t('2025-03-02T00:00:00Z'), now: t('2025-06-01T12:00:00Z') };

// TR (train, rated 100 m³/h) with a pump TR-P and a stage TR-S below it, neither rated.
const TR: DowntimeAsset = { id: 1, code: 'TR', parentId: null, parentCode: null, ratedPermeateM3h: 100 };
const TRP: DowntimeAsset = { id: 2, code: 'TR-P', parentId: 1, parentCode: 'TR', ratedPermeateM3h: null };
const TRS: DowntimeAsset = { id: 3, code: 'TR-S', parentId: 1, parentCode: 'TR', ratedPermeateM3h: null };
const tag = (id: number, name: string, asset: DowntimeAsset, quantity: DowntimeTag['quantity']): DowntimeTag => ({ id, name, assetId: asset.id, assetCode: asset.code, quantity });
// Ordered by name, as the tag register is read.
const tags = [tag(10, 'TR-P.RUN', TRP, 'run_status'), tag(11, 'TR-P.RUN-B', TRP, 'run_status'), tag(12, 'TR-S.QP', TRS, 'permeate_flow')];

// TR-P.RUN: data from 28 Feb 00:00 to 1 Mar 20:00 (coverage and good rollups agree), running since the end of
// a stop on 28 Feb 12:00; stopped 06:00–10:00, and again from 18:00 until the data ends.
const pumpRows: RunStatusRows = {
  coverage: { from: t('2025-02-28T00:00:00Z'), to: t('2025-03-01T20:00:00Z') },
  good: { firstHour: t('2025-02-28T00:00:00Z'), lastTs: t('2025-03-01T20:00:00Z') },
  stops: [
    { from: t('2025-03-01T06:00:00Z'), to: t('2025-03-01T10:00:00Z') },
    { from: t('2025-03-01T18:00:00Z'), to: null },
  ],
  lastStopEndBefore: t('2025-02-28T12:00:00Z'),
};

const wo = (woNumber: string, type: DowntimeWorkOrder['type'], oos: [string, string] | null, failureCode: string | null = null, status: DowntimeWorkOrder['status'] = 'closed'): DowntimeWorkOrder => ({
  woNumber,
  asset: 'TR-P',
  type,
  status,
  failureCode,
  outOfServiceFrom: oos ? t(oos[0]) : null,
  outOfServiceTo: oos ? t(oos[1]) : null,
});
// By number, as the service reads them.
const workOrders = [
  wo('WO-C', 'corrective', ['2025-03-01T05:00:00Z', '2025-03-01T08:00:00Z'], 'BEARING'),
  wo('WO-N', 'inspection', null),
  wo('WO-P', 'preventive', ['2025-03-01T17:00:00Z', '2025-03-01T19:00:00Z']),
  wo('WO-X', 'corrective', ['2025-03-01T06:00:00Z', '2025-03-01T10:00:00Z'], 'SEAL', 'cancelled'),
];

const input: DowntimeReportInput = { site: 'PLANT', assets: [TR, TRP, TRS], inScope: [TR, TRP, TRS], tags, runStatus: new Map([[10, pumpRows]]), workOrders };

/** The answer is exactly the schema's: parsing it (which drops undeclared keys) changes nothing. */
const exact = (answer: ReturnType<typeof buildDowntimeReport>) => expect(beforeFreshnessSchema(downtimeReportSchema).parse(answer)).toEqual(answer);

describe('buildDowntimeReport', () => {
  const report = buildDowntimeReport(input, day, settings);

  it('answers exactly the schema, with the keys of docs/design.md §7', () => {
    exact(report);
    for (const key of ['asset', 'from', 'to', 'hours', 'planned', 'cause', 'lostVolumeM3']) expect(report.events[0]).toHaveProperty(key);
    for (const key of ['asset', 'events', 'hours', 'plannedHours', 'unplannedHours', 'lostVolumeM3', 'cost']) expect(report.totals[0]).toHaveProperty(key);
  });

  it('counts the stops of the first run-status tag by name, cut where its data ends', () => {
    expect(report).toMatchObject({ site: 'PLANT', currency: 'EUR', waterValuePerM3: 0.5, from: '2025-03-01T00:00:00.000Z', to: '2025-03-02T00:00:00.000Z' });
    expect(report.events.map((e) => [e.asset, e.tag, e.from, e.to, e.hours, e.planned, e.cause, e.causeWorkOrder, e.lostVolumeM3, e.cost, e.clippedAtEnd])).toEqual([
      // 06:00–10:00 = 4 h; WO-C (corrective) shares 06:00–08:00 → BEARING; the cancelled WO-X is ignored.
      // 4 h × 100 m³/h (TR's rating) = 400 m³; × 0.5 per m³ = 200.
      ['TR-P', 'TR-P.RUN', '2025-03-01T06:00:00.000Z', '2025-03-01T10:00:00.000Z', 4, false, 'BEARING', 'WO-C', 400, 200, false],
      // 18:00 until the data ends at 20:00 = 2 h (the state after the last good sample is unknown);
      // WO-P (preventive) is out of service 17:00–19:00 → planned; no corrective overlap → unknown.
      ['TR-P', 'TR-P.RUN', '2025-03-01T18:00:00.000Z', '2025-03-01T20:00:00.000Z', 2, true, 'unknown', null, 200, 100, true],
    ]);
    expect(report.events[0]!.causeOverlapHours).toBe(2);
    expect(report.events[1]!.plannedBy).toEqual(['WO-P']);
  });

  it('totals the asset with the rating of its nearest rated ancestor, and ranks causes by hours', () => {
    // 2 stops, 6 h (2 planned, 4 not), 600 m³, 300.
    expect(report.totals).toEqual([
      { asset: 'TR-P', events: 2, hours: 6, plannedHours: 2, unplannedHours: 4, lostVolumeM3: 600, cost: 300, tag: 'TR-P.RUN', ratedPermeateM3h: 100, ratedPermeateFrom: 'TR' },
    ]);
    expect(report.plant).toEqual({ events: 2, hours: 6, plannedHours: 2, unplannedHours: 4, lostVolumeM3: 600, cost: 300 });
    // BEARING 4 of 6 h, unknown 2 of 6 h.
    expect(report.paretoByCause.map((r) => [r.key, r.hours, r.share, r.cumulativeShare])).toEqual([
      ['BEARING', 4, 4 / 6, 4 / 6],
      ['unknown', 2, 2 / 6, 1],
    ]);
  });

  it('says which tag it used, whose rating priced the volume and where stops were cut', () => {
    expect(report.notes).toEqual([
      'TR-P has several run-status tags: TR-P.RUN is used, TR-P.RUN-B is not.',
      'TR-P has no rated permeate flow: the 100 m³/h of TR is used for its lost volume.',
      'TR-P (TR-P.RUN) has run-status data only until 2025-03-01T20:00:00.000Z: stops are cut there.',
      'Some stops were still open at the window end: they are cut there (clippedAtEnd).',
    ]);
  });

  it('gives as provenance the tag, its data span and the orders that planned a stop or gave its cause', () => {
    expect(report.provenance).toEqual({
      workOrders: ['WO-C', 'WO-P'],
      tags: ['TR-P.RUN'],
      windows: [
        { from: '2025-03-01T00:00:00.000Z', to: '2025-03-02T00:00:00.000Z', what: 'window' },
        { from: '2025-02-28T00:00:00.000Z', to: '2025-03-01T20:00:00.000Z', what: 'run-status data of TR-P.RUN' },
        { from: '2025-03-01T05:00:00.000Z', to: '2025-03-01T08:00:00.000Z', what: 'out of service WO-C' },
        { from: '2025-03-01T17:00:00.000Z', to: '2025-03-01T19:00:00.000Z', what: 'out of service WO-P' },
      ],
    });
  });
});

describe('degenerate input', () => {
  it('no window: an empty window at the time of asking, or at the one bound given, with a note', () => {
    const empty: DowntimeReportInput = { site: 'EMPTY', assets: [], inScope: [], tags: [], runStatus: new Map(), workOrders: [] };
    const r = buildDowntimeReport(empty, { from: null, to: null, now: day.now }, settings);
    exact(r);
    expect([r.from, r.to]).toEqual(['2025-06-01T12:00:00.000Z', '2025-06-01T12:00:00.000Z']);
    expect(r.plant).toEqual({ events: 0, hours: 0, plannedHours: 0, unplannedHours: 0, lostVolumeM3: 0, cost: 0 });
    expect(r.notes).toEqual(['Site EMPTY has no data to bound a window: give from and to, or import data first.']);
    expect(r.provenance).toEqual({ workOrders: [], tags: [], windows: [] });
    expect(buildDowntimeReport(empty, { from: null, to: day.to, now: day.now }, settings).from).toBe('2025-03-02T00:00:00.000Z');
  });

  it('no run-status tag in scope: no events, no totals, and why', () => {
    const r = buildDowntimeReport({ ...input, inScope: [TRS], runStatus: new Map() }, day, settings);
    exact(r);
    expect([r.events, r.totals]).toEqual([[], []]);
    expect(r.notes).toEqual(['No asset in scope has a run-status tag: there are no stop events to count.']);
    expect(r.provenance).toEqual({ workOrders: [], tags: [], windows: [{ from: '2025-03-01T00:00:00.000Z', to: '2025-03-02T00:00:00.000Z', what: 'window' }] });
  });

  it('a tag without good data: a zero row and the reasons', () => {
    const r = buildDowntimeReport({ ...input, inScope: [TRP], runStatus: new Map([[10, { ...pumpRows, good: null }]]) }, day, settings);
    exact(r);
    expect(r.events).toEqual([]);
    expect(r.totals.map((x) => [x.asset, x.events, x.hours])).toEqual([['TR-P', 0, 0]]);
    expect(r.notes).toContain('TR-P.RUN has no good-quality run-status data.');
    expect(r.notes).toContain('TR-P (TR-P.RUN) has no good run-status sample in the window: no stops counted.');
    expect(r.provenance.windows.map((w) => w.what)).toEqual(['window']);
  });

  it('refuses input without the rows of a tag it counts', () => {
    expect(() => buildDowntimeReport({ ...input, runStatus: new Map() }, day, settings)).toThrow(/no rows for tag TR-P\.RUN/);
  });
});
