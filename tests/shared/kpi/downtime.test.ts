import { describe, expect, it } from 'vitest';
import {
  assetScope,
  downtimeReport,
  stopSpans,
  type AssetNode,
  type DowntimeInput,
  type DowntimeWorkOrder,
} from '#shared/kpi/downtime.ts';
import type { RunStatusSample } from '#shared/kpi/operating-time.ts';
import { downtimeQuerySchema, paretoRowSchema } from '#shared/schemas/downtime.ts';

// A hand-worked invented plant. Tree: RO1 (train) → RO1-S1 (stage) → V-101 (vessel); P-101 (pump) under RO1;
// RO2 a second train. Window 1–8 May 2024, UTC.
const t = (iso: string) => new Date(iso);
const s = (iso: string, value: number): RunStatusSample => ({ time: t(iso), value });
const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-08T00:00:00Z') };

const tree: AssetNode[] = [
  { code: 'RO1', parent: null },
  { code: 'RO1-S1', parent: 'RO1' },
  { code: 'V-101', parent: 'RO1-S1' },
  { code: 'P-101', parent: 'RO1' },
  { code: 'RO2', parent: null },
];

function wo(
  woNumber: string,
  asset: string,
  type: DowntimeWorkOrder['type'],
  oos: [string, string] | null,
  failureCode: string | null = null,
  status: DowntimeWorkOrder['status'] = 'closed',
): DowntimeWorkOrder {
  return {
    woNumber,
    asset,
    type,
    status,
    failureCode,
    outOfServiceFrom: oos ? t(oos[0]) : null,
    outOfServiceTo: oos ? t(oos[1]) : null,
  };
}

const workOrders: DowntimeWorkOrder[] = [
  // Overlaps RO1's first stop (2 May 06:00–14:00) on a vessel below RO1: that stop is planned.
  wo('PM-1', 'V-101', 'preventive', ['2024-05-02T05:00:00Z', '2024-05-02T15:00:00Z']),
  // Both overlap RO1's second stop (4 May 00:00–03:00): CM-1 by 2 h (01:00–03:00), CM-2 by 1.5 h (00:00–01:30).
  wo('CM-1', 'P-101', 'corrective', ['2024-05-04T01:00:00Z', '2024-05-04T05:00:00Z'], 'seal-leak'),
  wo('CM-2', 'RO1-S1', 'corrective', ['2024-05-03T23:00:00Z', '2024-05-04T01:30:00Z'], 'element-damage'),
  // Overlap RO1's third stop (7 May 20:00 – window end) but do not count: cancelled, or another train.
  wo('CM-3', 'RO1', 'corrective', ['2024-05-07T19:00:00Z', '2024-05-07T23:00:00Z'], 'fouling', 'cancelled'),
  wo('CM-4', 'RO2', 'corrective', ['2024-05-07T19:00:00Z', '2024-05-07T23:00:00Z'], 'motor-trip'),
  wo('IN-1', 'RO2', 'inspection', ['2024-05-07T21:00:00Z', '2024-05-07T22:00:00Z']),
  // No out-of-service window: never overlaps.
  wo('PM-2', 'RO1', 'preventive', null),
];

const input: DowntimeInput = {
  window,
  assetTree: tree,
  workOrders,
  settings: { waterValuePerM3: 0.85 },
  assets: [
    {
      asset: 'RO1',
      ratedPermeateM3h: 50,
      runStatusTag: 'RO1.RUN',
      priorSample: s('2024-04-30T12:00:00Z', 1),
      samples: [
        s('2024-05-02T06:00:00Z', 0),
        s('2024-05-02T14:00:00Z', 1),
        s('2024-05-03T00:00:00Z', 1),
        s('2024-05-04T00:00:00Z', 0),
        s('2024-05-04T03:00:00Z', 1),
        s('2024-05-07T20:00:00Z', 0),
      ],
    },
    {
      // No rated permeate flow; state unknown before its first sample at the window start.
      asset: 'P-101',
      ratedPermeateM3h: null,
      runStatusTag: 'P101.RUN',
      samples: [s('2024-05-01T00:00:00Z', 1), s('2024-05-04T00:30:00Z', 0), s('2024-05-04T04:30:00Z', 1)],
    },
  ],
};

describe('downtime report (hand-worked plant)', () => {
  const report = downtimeReport(input);

  it('finds each stop from run-status edges and classifies it', () => {
    expect(report.events.map(({ asset, from, to, hours, planned, cause, lostVolumeM3 }) => ({ asset, from, to, hours, planned, cause, lostVolumeM3 }))).toEqual([
      // Planned: PM-1 on V-101 (below RO1). No corrective overlap → unknown. 8 h × 50 m³/h = 400 m³.
      { asset: 'RO1', from: '2024-05-02T06:00:00.000Z', to: '2024-05-02T14:00:00.000Z', hours: 8, planned: true, cause: 'unknown', lostVolumeM3: 400 },
      // Unplanned; CM-1 overlaps 2 h > CM-2's 1.5 h → seal-leak. 3 h × 50 = 150 m³.
      { asset: 'RO1', from: '2024-05-04T00:00:00.000Z', to: '2024-05-04T03:00:00.000Z', hours: 3, planned: false, cause: 'seal-leak', lostVolumeM3: 150 },
      // P-101 stopped 00:30–04:30, but RO1 above it was stopped until 03:00: that part is RO1's stop (counted
      // once), the pump's own stop is 03:00–04:30. Its scope is itself only: CM-1 overlaps 1.5 h → seal-leak;
      // no rated flow → null.
      { asset: 'P-101', from: '2024-05-04T03:00:00.000Z', to: '2024-05-04T04:30:00.000Z', hours: 1.5, planned: false, cause: 'seal-leak', lostVolumeM3: null },
      // Open at the window end: cut at 8 May 00:00 (4 h). CM-3 cancelled, CM-4/IN-1 on RO2 → unplanned, unknown.
      { asset: 'RO1', from: '2024-05-07T20:00:00.000Z', to: '2024-05-08T00:00:00.000Z', hours: 4, planned: false, cause: 'unknown', lostVolumeM3: 200 },
    ]);
  });

  it('keeps the provenance and flags of each event', () => {
    const [first, second, pump, last] = report.events;
    expect(first).toMatchObject({ plannedBy: ['PM-1'], causeWorkOrder: null, clippedAtStart: false, clippedAtEnd: false, tag: 'RO1.RUN', cost: 340 });
    expect(second).toMatchObject({ plannedBy: [], causeWorkOrder: 'CM-1', causeOverlapHours: 2, cost: 127.5, alsoStopped: ['P-101'] });
    expect(pump).toMatchObject({ causeWorkOrder: 'CM-1', causeOverlapHours: 1.5, cost: null, tag: 'P101.RUN', clippedAtStart: false, alsoStopped: [] });
    expect(first!.alsoStopped).toEqual([]);
    expect(last).toMatchObject({ clippedAtEnd: true, clippedAtStart: false, plannedBy: [], causeWorkOrder: null, cost: 170 });
  });

  it('totals each asset (keys of `kpi downtime --json`)', () => {
    expect(report.totals.map(({ asset, events, hours, plannedHours, unplannedHours, lostVolumeM3, cost }) => ({ asset, events, hours, plannedHours, unplannedHours, lostVolumeM3, cost }))).toEqual([
      // 8 + 3 + 4 = 15 h; 750 m³ × 0.85 = 637.5.
      { asset: 'RO1', events: 3, hours: 15, plannedHours: 8, unplannedHours: 7, lostVolumeM3: 750, cost: 637.5 },
      { asset: 'P-101', events: 1, hours: 1.5, plannedHours: 0, unplannedHours: 1.5, lostVolumeM3: null, cost: null },
    ]);
  });

  it('builds the Pareto by cause, sorted descending with cumulative share', () => {
    // unknown 8 + 4 = 12 h, seal-leak 3 + 1.5 = 4.5 h; of 16.5 h.
    expect(report.paretoByCause).toEqual([
      { key: 'unknown', events: 2, hours: 12, plannedHours: 8, unplannedHours: 4, lostVolumeM3: 600, cost: 510, share: 12 / 16.5, cumulativeShare: 12 / 16.5 },
      { key: 'seal-leak', events: 2, hours: 4.5, plannedHours: 0, unplannedHours: 4.5, lostVolumeM3: null, cost: null, share: 4.5 / 16.5, cumulativeShare: 1 },
    ]);
  });

  it('builds the Pareto by asset', () => {
    expect(report.paretoByAsset.map((r) => [r.key, r.hours, r.share, r.cumulativeShare])).toEqual([
      ['RO1', 15, 15 / 16.5, 15 / 16.5],
      ['P-101', 1.5, 1.5 / 16.5, 1],
    ]);
  });

  it('notes what it could not value and what it cut', () => {
    expect(report.notes).toEqual([
      'P-101 has no rated permeate flow: its lost volume and cost are null.',
      "Stops of one asset that stopped while an asset above them was stopped too are counted once, in that asset's event (alsoStopped).",
      'Some stops were still open at the window end: they are cut there (clippedAtEnd).',
    ]);
  });
});

describe('cause and classification rules', () => {
  const base = (workOrders: DowntimeWorkOrder[]): DowntimeInput => ({
    window: { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') },
    assetTree: tree,
    workOrders,
    settings: { waterValuePerM3: 1 },
    assets: [
      {
        asset: 'RO1',
        ratedPermeateM3h: 10,
        runStatusTag: 'RO1.RUN',
        priorSample: s('2024-04-30T00:00:00Z', 1),
        samples: [s('2024-05-01T10:00:00Z', 0), s('2024-05-01T14:00:00Z', 1)],
      },
    ],
  });
  const only = (w: DowntimeWorkOrder[]) => downtimeReport(base(w)).events[0]!;

  it.each([
    ['an inspection on the train itself makes the stop planned', [wo('IN-9', 'RO1', 'inspection', ['2024-05-01T13:00:00Z', '2024-05-01T18:00:00Z'])], true],
    ['a predictive order does not', [wo('PD-9', 'RO1', 'predictive', ['2024-05-01T09:00:00Z', '2024-05-01T15:00:00Z'])], false],
    ['a window that only touches the stop does not overlap', [wo('PM-9', 'RO1', 'preventive', ['2024-05-01T14:00:00Z', '2024-05-01T16:00:00Z'])], false],
    ['an order on another train is outside the scope (only the asset and below)', [wo('PM-9', 'RO2', 'preventive', ['2024-05-01T09:00:00Z', '2024-05-01T15:00:00Z'])], false],
  ] as const)('%s', (_label, wos, planned) => {
    expect(only([...wos]).planned).toBe(planned);
  });

  it('takes the corrective order with the largest overlap, then the earlier window, then the lower number', () => {
    // A: 10:00–12:00 (2 h), B: 11:00–13:00 (2 h), C: 12:00–13:30 (1.5 h): A and B tie on overlap, A starts first.
    const wos = [
      wo('CM-B', 'V-101', 'corrective', ['2024-05-01T11:00:00Z', '2024-05-01T13:00:00Z'], 'b-code'),
      wo('CM-C', 'RO1', 'corrective', ['2024-05-01T12:00:00Z', '2024-05-01T13:30:00Z'], 'c-code'),
      wo('CM-A', 'P-101', 'corrective', ['2024-05-01T10:00:00Z', '2024-05-01T12:00:00Z'], 'a-code'),
    ];
    expect(only(wos)).toMatchObject({ cause: 'a-code', causeWorkOrder: 'CM-A', causeOverlapHours: 2 });
    const sameStart = [
      wo('CM-2', 'RO1', 'corrective', ['2024-05-01T10:00:00Z', '2024-05-01T12:00:00Z'], 'second'),
      wo('CM-1', 'RO1', 'corrective', ['2024-05-01T10:00:00Z', '2024-05-01T12:00:00Z'], 'first'),
    ];
    expect(only(sameStart).cause).toBe('first');
  });

  it("gives 'unknown' when the best-overlapping corrective order has no failure code", () => {
    const e = only([
      wo('CM-1', 'RO1', 'corrective', ['2024-05-01T09:00:00Z', '2024-05-01T15:00:00Z'], '  '),
      wo('CM-2', 'RO1', 'corrective', ['2024-05-01T13:00:00Z', '2024-05-01T15:00:00Z'], 'pump-trip'),
    ]);
    expect(e).toMatchObject({ cause: 'unknown', causeWorkOrder: 'CM-1', causeOverlapHours: 4 });
  });

  it('refuses a work order with only one out-of-service bound', () => {
    const bad: DowntimeWorkOrder = { ...wo('PM-X', 'RO1', 'preventive', null), outOfServiceFrom: t('2024-05-01T00:00:00Z') };
    expect(() => only([bad])).toThrow(/both be set or both be empty/);
  });
});

describe('stop spans and edge cases', () => {
  const day = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') };
  const hours = (spans: ReturnType<typeof stopSpans>) => spans.map((x) => (x.toMs - x.fromMs) / 3_600_000);

  it.each([
    ['no samples', [], undefined, [], []],
    ['running all day', [s('2024-05-01T00:00:00Z', 1)], undefined, [], []],
    ['stopped all day (known from the prior sample): one event cut at both ends', [], s('2024-04-29T00:00:00Z', 0), [24], [[true, true]]],
    ['stopped at the first sample with no prior: start hidden, flagged', [s('2024-05-01T06:00:00Z', 0), s('2024-05-01T09:00:00Z', 1)], undefined, [3], [[true, false]]],
    ['an edge exactly at the window start after running: not clipped', [s('2024-05-01T00:00:00Z', 0), s('2024-05-01T02:00:00Z', 1)], s('2024-04-30T20:00:00Z', 1), [2], [[false, false]]],
    ['two stops with a run between', [s('2024-05-01T01:00:00Z', 0), s('2024-05-01T02:00:00Z', 1), s('2024-05-01T05:00:00Z', 0), s('2024-05-01T07:30:00Z', 1)], s('2024-04-30T23:00:00Z', 1), [1, 2.5], [[false, false], [false, false]]],
  ] as const)('%s', (_label, samples, prior, expectedHours, flags) => {
    const spans = stopSpans(samples, day, prior);
    expect(hours(spans)).toEqual(expectedHours);
    expect(spans.map((x) => [x.clippedAtStart, x.clippedAtEnd])).toEqual(flags);
  });

  it('counts a stop across a daylight-saving change in real hours (Europe/Berlin spring-forward)', () => {
    // Stopped 01:00 CET (00:00Z) to 04:00 CEST (02:00Z): the wall clock says 3 h, real time is 2 h.
    const spans = stopSpans([s('2024-03-31T00:00:00Z', 0), s('2024-03-31T02:00:00Z', 1)], { from: t('2024-03-30T23:00:00Z'), to: t('2024-03-31T22:00:00Z') }, s('2024-03-30T22:00:00Z', 1));
    expect(hours(spans)).toEqual([2]);
  });

  it('gives an asset without samples a zero totals row and a note; no assets gives empty tables', () => {
    const report = downtimeReport({ ...input, assets: [{ asset: 'RO2', ratedPermeateM3h: 40, runStatusTag: 'RO2.RUN', samples: [] }] });
    expect(report.events).toEqual([]);
    expect(report.totals).toEqual([
      { asset: 'RO2', events: 0, hours: 0, plannedHours: 0, unplannedHours: 0, lostVolumeM3: 0, cost: 0, tag: 'RO2.RUN', ratedPermeateM3h: 40, ratedPermeateFrom: 'RO2' },
    ]);
    expect(report.paretoByCause).toEqual([]);
    expect(report.paretoByAsset).toEqual([]);
    expect(report.notes).toEqual(['RO2 (RO2.RUN) has no good run-status sample in the window: no stops counted.']);
    const none = downtimeReport({ ...input, assets: [] });
    expect(none.totals).toEqual([]);
  });

  it('makes every cost null, with a note, when no water value is set', () => {
    const report = downtimeReport({ ...input, settings: { waterValuePerM3: null } });
    expect(report.events.every((e) => e.cost === null)).toBe(true);
    expect(report.totals[0]).toMatchObject({ lostVolumeM3: 750, cost: null });
    expect(report.notes[0]).toBe('No water value per m³ is set: costs are null.');
  });

  it.each([
    ['a negative rated flow', { ...input, assets: [{ ...input.assets[0]!, ratedPermeateM3h: -1 }] }, /rated permeate flow of RO1 must be a finite number ≥ 0/],
    ['a negative water value', { ...input, settings: { waterValuePerM3: -0.1 } }, /waterValuePerM3/],
    ['an asset listed twice', { ...input, assets: [input.assets[0]!, input.assets[0]!] }, /listed twice/],
    ['a window that ends before it starts', { ...input, window: { from: window.to, to: window.from } }, /invalid-window/],
    ['an out-of-service window ending before it starts', { ...input, workOrders: [wo('CM-9', 'RO1', 'corrective', ['2024-05-03T00:00:00Z', '2024-05-02T00:00:00Z'])] }, /ends before it starts/],
  ] as const)('refuses %s', (_label, bad, message) => {
    expect(() => downtimeReport(bad as DowntimeInput)).toThrow(message);
  });
});

describe('asset scope', () => {
  it('covers the asset and everything below it', () => {
    expect([...assetScope(tree, 'RO1')].sort()).toEqual(['P-101', 'RO1', 'RO1-S1', 'V-101']);
    expect([...assetScope(tree, 'RO1-S1')].sort()).toEqual(['RO1-S1', 'V-101']);
    expect([...assetScope(tree, 'NEW-1')]).toEqual(['NEW-1']);
  });

  it('does not look upward: a preventive order on the train does not plan a stop of its stage', () => {
    const stage = (workOrders: DowntimeWorkOrder[]) =>
      downtimeReport({
        window: { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') },
        assetTree: tree,
        workOrders,
        settings: { waterValuePerM3: 1 },
        assets: [{ asset: 'RO1-S1', ratedPermeateM3h: 10, runStatusTag: 'S1.RUN', priorSample: s('2024-04-30T00:00:00Z', 1), samples: [s('2024-05-01T10:00:00Z', 0), s('2024-05-01T12:00:00Z', 1)] }],
      }).events[0]!.planned;
    expect(stage([wo('PM-T', 'RO1', 'preventive', ['2024-05-01T09:00:00Z', '2024-05-01T13:00:00Z'])])).toBe(false);
    expect(stage([wo('PM-V', 'V-101', 'preventive', ['2024-05-01T09:00:00Z', '2024-05-01T13:00:00Z'])])).toBe(true);
  });

  it('refuses a cycle', () => {
    expect(() => assetScope([{ code: 'A', parent: 'B' }, { code: 'B', parent: 'A' }], 'A')).toThrow(/cycle/);
  });
});

describe('query schema', () => {
  it('parses the window query and refuses a bad date', () => {
    expect(downtimeQuerySchema.parse({ site: 'PLANT', from: '2024-05-01', to: '2024-05-08T00:00:00+02:00' })).toMatchObject({ site: 'PLANT', from: '2024-05-01' });
    expect(downtimeQuerySchema.safeParse({ from: '1 May' }).success).toBe(false);
  });
});

describe('data ending inside the window', () => {
  // Hand-worked: stopped from 20:00 with no later sample; data ends at 22:00, window at midnight → 2 h, not 4 h.
  const report = (dataUntil: Date | null) =>
    downtimeReport({
      window: { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') },
      assetTree: tree,
      workOrders: [],
      settings: { waterValuePerM3: 1 },
      assets: [{ asset: 'RO1', ratedPermeateM3h: 10, runStatusTag: 'RO1.RUN', dataUntil, samples: [s('2024-05-01T00:00:00Z', 1), s('2024-05-01T20:00:00Z', 0)] }],
    });

  it('cuts a stop still open at the end of the data there, not at the window end', () => {
    const cut = report(t('2024-05-01T22:00:00Z'));
    expect(cut.events).toHaveLength(1);
    expect(cut.events[0]).toMatchObject({ from: '2024-05-01T20:00:00.000Z', to: '2024-05-01T22:00:00.000Z', hours: 2, clippedAtEnd: true });
    expect(cut.notes.join(' ')).toMatch(/only until 2024-05-01T22:00:00.000Z/);
  });

  it('changes nothing when the data reaches the window end, or when dataUntil is not given', () => {
    expect(report(t('2024-05-03T00:00:00Z')).events[0]!.hours).toBe(4);
    expect(report(null).events[0]!.hours).toBe(4);
  });
});

describe('a train and the pump that stops with it', () => {
  // Hand-worked: RO1 (train, 60 m³/h) stops 2 May 10:00–16:00; its pump P-101 (no rating of its own here,
  // so the service would give it RO1's; this input gives it 60 directly) stops 09:00–17:00 that day and
  // again 3 May 08:00–10:00 while the train runs.
  const report = downtimeReport({
    window,
    assetTree: tree,
    workOrders: [wo('CM-9', 'P-101', 'corrective', ['2024-05-02T09:00:00Z', '2024-05-02T17:00:00Z'], 'coupling')],
    settings: { waterValuePerM3: 0.5 },
    assets: [
      { asset: 'RO1', ratedPermeateM3h: 60, runStatusTag: 'RO1.RUN', priorSample: s('2024-04-30T00:00:00Z', 1), samples: [s('2024-05-02T10:00:00Z', 0), s('2024-05-02T16:00:00Z', 1)] },
      {
        asset: 'P-101',
        ratedPermeateM3h: 60,
        runStatusTag: 'P101.RUN',
        priorSample: s('2024-04-30T00:00:00Z', 1),
        samples: [s('2024-05-02T09:00:00Z', 0), s('2024-05-02T17:00:00Z', 1), s('2024-05-03T08:00:00Z', 0), s('2024-05-03T10:00:00Z', 1)],
      },
    ],
  });

  it('counts the shared hours once, at train level, with the cause from the work order below it', () => {
    expect(report.events.map((e) => [e.asset, e.from.slice(5, 16), e.to.slice(5, 16), e.hours, e.cause, e.alsoStopped])).toEqual([
      ['P-101', '05-02T09:00', '05-02T10:00', 1, 'coupling', []],
      ['RO1', '05-02T10:00', '05-02T16:00', 6, 'coupling', ['P-101']],
      ['P-101', '05-02T16:00', '05-02T17:00', 1, 'coupling', []],
      ['P-101', '05-03T08:00', '05-03T10:00', 2, 'unknown', []],
    ]);
  });

  it('adds up to the same hours, volume and cost by asset, by cause and for the plant', () => {
    // 6 + 1 + 1 + 2 = 10 h (not 6 + 8 + 2 = 16 h); 10 h × 60 m³/h = 600 m³; × 0.5 = 300.
    expect(report.plant).toEqual({ events: 4, hours: 10, plannedHours: 0, unplannedHours: 10, lostVolumeM3: 600, cost: 300 });
    for (const rows of [report.totals, report.paretoByCause, report.paretoByAsset]) {
      expect(rows.reduce((a, r) => a + r.hours, 0)).toBeCloseTo(report.plant.hours, 9);
      expect(rows.reduce((a, r) => a + r.lostVolumeM3!, 0)).toBeCloseTo(report.plant.lostVolumeM3!, 9);
      expect(rows.reduce((a, r) => a + r.cost!, 0)).toBeCloseTo(report.plant.cost!, 9);
      expect(rows.reduce((a, r) => a + r.events, 0)).toBe(report.plant.events);
    }
  });
});

describe('Pareto shares', () => {
  it('end at exactly 1 whatever the durations (a sum of fractional hours once gave 1.0000000000000004)', () => {
    // Stops of 0.1 h, 0.2 h and 0.7 h, ten times over: 0.1 + 0.2 + 0.7 in floating point is not 1.
    const samples: RunStatusSample[] = [];
    for (let day = 1; day <= 7; day++) {
      let at = Date.UTC(2024, 4, day, 1);
      for (const minutes of [6, 12, 42]) {
        samples.push({ time: new Date(at), value: 0 }, { time: new Date(at + minutes * 60_000), value: 1 });
        at += 3 * 3_600_000;
      }
    }
    const causes = ['a', 'b', 'c'];
    const orders = samples
      .filter((x) => x.value === 0)
      .map((x, i) => wo(`CM-${i}`, 'RO1', 'corrective', [x.time.toISOString(), new Date(x.time.getTime() + 42 * 60_000).toISOString()], causes[i % 3]));
    const r = downtimeReport({ window, assetTree: tree, workOrders: orders, settings: { waterValuePerM3: 1 }, assets: [{ asset: 'RO1', ratedPermeateM3h: 1, runStatusTag: 'RO1.RUN', priorSample: s('2024-04-30T00:00:00Z', 1), samples }] });
    expect(r.paretoByCause.map((p) => p.key)).toEqual(['c', 'b', 'a']);
    expect(r.paretoByCause.at(-1)!.cumulativeShare).toBe(1);
    expect(r.paretoByCause.every((p) => p.cumulativeShare <= 1 && p.share <= 1)).toBe(true);
    expect(() => paretoRowSchema.array().parse(r.paretoByCause)).not.toThrow();
  });
});
