// The element life answer built from plain rows, without a database: a handful of invented installs worked
// by hand. Window rule: docs/design.md §6 (Element life) and docs/decisions/002-element-life-window.md;
// risk sets with delayed entry: Klein & Moeschberger, Survival Analysis, 2nd ed., ch. 4; Kaplan–Meier and
// Greenwood's standard error: Kaplan & Meier (1958), Greenwood (1926).
import { isDeepStrictEqual } from 'node:util';
import { describe, expect, it } from 'vitest';
import {
  buildElementLifeReport,
  compareGroupKeys,
  elementGroupKey,
  groupLives,
  observeLives,
  serialProvenance,
  windowTreatmentOf,
  type ElementInstall,
  type ElementLifeAnswer,
  type ElementLifeReportInput,
  type VesselPlace,
} from '#shared/kpi/element-life-report.ts';
import { fitWeibull, kaplanMeier } from '#shared/kpi/element-life.ts';
import { PROVENANCE_CAP } from '#shared/kpi/provenance.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';

const at = (iso: string) => new Date(`${iso}T00:00:00Z`);
const from = at('2020-01-01');
const to = at('2021-01-01');

// Vessels 1 and 2 of train T1 are in scope; vessel 3 is not.
const places = new Map<number, VesselPlace>([
  [1, { vessel: 'V1', stage: 'S1', train: 'T1' }],
  [2, { vessel: 'V2', stage: 'S2', train: 'T1' }],
]);

let id = 0;
const install = (serial: string, vesselId: number, position: number, model: string, installed: string, removed: string | null, reason: string | null): ElementInstall => ({
  id: ++id,
  serial,
  model,
  vesselId,
  position,
  installedAt: at(installed),
  removedAt: removed === null ? null : at(removed),
  removalReason: reason,
});

const installs = [
  // Began before the window, failed in it: enters at 365 d (2019 has 365 days), ends at 365 + 182 = 547 d (Jan–Jun 2020: 31+29+31+30+31+30).
  install('E1', 1, 1, 'A', '2019-01-01', '2020-07-01', 'failed'),
  // Removed before the window: left out.
  install('E2', 1, 2, 'A', '2019-06-01', '2019-12-01', 'failed'),
  // Still in service at the end: censored at 306 d (Mar–Dec 2020).
  install('E3', 2, 1, 'B', '2020-03-01', null, null),
  // A planned removal in the window: censored at 243 d (Feb 29 + Mar–Sep).
  install('E4', 2, 2, 'B', '2020-02-01', '2020-10-01', 'planned'),
  // Failed after the window: censored at the end, 184 d (Jul–Dec).
  install('E5', 1, 1, 'A', '2020-07-01', '2021-03-01', 'failed'),
  // A vessel out of scope, and an install after the window: left out.
  install('E6', 3, 1, 'A', '2020-02-01', '2020-05-01', 'failed'),
  install('E7', 2, 1, 'B', '2021-02-01', null, null),
  // Installed at the window's start (not late), damaged after 100 d (31 + 29 + 31 + 9).
  install('E8', 1, 3, 'A', '2020-01-01', '2020-04-10', 'damaged'),
];
const input: ElementLifeReportInput = { site: 'S', places, installs };
const window = { from, to, confidence: 0.9, groupBy: 'all' as const };

function checkedAgainstSchema(report: ElementLifeAnswer): ElementLifeAnswer {
  const parsed = beforeFreshnessSchema(elementLifeReportSchema).parse(report);
  expect(isDeepStrictEqual(JSON.parse(JSON.stringify(parsed)), JSON.parse(JSON.stringify(report)))).toBe(true);
  return report;
}

describe('observeLives: the window rule (docs/design.md §6, docs/decisions/002-element-life-window.md)', () => {
  const lives = observeLives(installs, places, 'all', from, to);

  it('keeps every life overlapping the window in a vessel of the scope, with its age at entry and exit in days', () => {
    expect(lives.map((l) => [l.serial, l.entryDays, l.days, l.event, l.censoredAtEnd])).toEqual([
      ['E1', 365, 547, true, false],
      ['E3', 0, 306, false, true],
      ['E4', 0, 243, false, false],
      ['E5', 0, 184, false, true],
      ['E8', 0, 100, true, false],
    ]);
  });

  it('with an open start, every life enters at 0, so the one removed before the window counts too', () => {
    const open = observeLives(installs, places, 'all', null, to);
    expect(open.map((l) => l.serial)).toEqual(['E1', 'E2', 'E3', 'E4', 'E5', 'E8']);
    expect(open.every((l) => l.entryDays === 0)).toBe(true);
    // E2: 2019-06-01 to 2019-12-01 = 183 d, failed.
    expect(open[1]).toMatchObject({ days: 183, event: true });
  });

  it('says how many lives crossed each edge', () => {
    const treatment = windowTreatmentOf(lives);
    expect(treatment).toMatchObject({ enteredLate: 1, censoredAtEnd: 2 });
    expect(treatment.text).toBe(
      "Every element life overlapping the window is used (5). 1 life began before the window's start and enter at their age then: they count at risk only " +
        'from that age on, and the Weibull fit takes their survival to it as given (delayed entry, left truncation). Lives that ended before the window are left out. ' +
        "2 were still in service at the window's end (or removed later) and are censored at their age then. Events are the failed, performance and damaged removals inside the window.",
    );
    expect(windowTreatmentOf([])).toEqual({ enteredLate: 0, censoredAtEnd: 0, text: 'Every element life in the window (0) is observed from its installation. Events are the failed, performance and damaged removals inside the window.' });
  });
});

describe('group keys (docs/design.md §6 Groups)', () => {
  it('names train, stage, position and model, with (none) for a vessel outside a train or stage', () => {
    const e = installs[0]!;
    expect(elementGroupKey('all', e, places.get(1)!)).toBe('all');
    expect(elementGroupKey('train', e, places.get(1)!)).toBe('train=T1');
    expect(elementGroupKey('stage', e, { vessel: 'V9', stage: null, train: null })).toBe('stage=(none)');
    expect(elementGroupKey('position', e, places.get(1)!)).toBe('position=1');
    expect(elementGroupKey('model', e, places.get(1)!)).toBe('model=A');
  });

  it('orders all first, positions by number, the rest by text', () => {
    expect(['position=10', 'all', 'position=9', 'position=2'].sort(compareGroupKeys)).toEqual(['all', 'position=2', 'position=9', 'position=10']);
    expect(['stage=T2-S1', 'stage=T1-S2', 'all', 'stage=T1-S1'].sort(compareGroupKeys)).toEqual(['all', 'stage=T1-S1', 'stage=T1-S2', 'stage=T2-S1']);
  });

  it('keeps the all group with no lives, and no other empty group', () => {
    expect([...groupLives([], 'all').keys()]).toEqual(['all']);
    expect([...groupLives([], 'train').keys()]).toEqual([]);
  });
});

describe('buildElementLifeReport', () => {
  const report = checkedAgainstSchema(buildElementLifeReport(input, window));

  it('counts the risk sets with delayed entry: at 100 d E1 (entered at 365 d) is not yet at risk, n = 4 and S = 3/4 (Klein & Moeschberger ch. 4)', () => {
    const all = report.groups[0]!;
    expect(all).toMatchObject({ key: 'all', n: 5, events: 2, enteredLate: 1 });
    expect(all.km.map((r) => [r.tDays, r.nRisk, r.nEvents, r.nCensored])).toEqual([
      [100, 4, 1, 0],
      [184, 3, 0, 1],
      [243, 2, 0, 1],
      [306, 1, 0, 1],
      [547, 1, 1, 0],
    ]);
    expect(all.km[0]!.survival).toBeCloseTo(0.75, 12);
    // Greenwood: S·√(d/(n(n − d))) = 0.75·√(1/12).
    expect(all.km[0]!.se).toBeCloseTo(0.75 * Math.sqrt(1 / 12), 12);
    // At 547 d only E1 is at risk and fails: S = 0; the median is the first age with S ≤ 0.5.
    expect(all.km[4]!.survival).toBe(0);
    expect(all.kmMedianDays).toBe(547);
  });

  it('fits the Weibull to those lives with their entry ages, and the rank regression to the four seen from installation', () => {
    const all = report.groups[0]!;
    const direct = fitWeibull([547, 306, 243, 184, 100], [true, false, false, false, true], { confidence: 0.9, entries: [365, 0, 0, 0, 0] }).fit!;
    expect(all.weibull).toMatchObject({ shape: direct.shape, scaleDays: direct.scale, intervalMethod: 'likelihood-ratio' });
    expect(report.notes).toEqual([
      report.windowTreatment.text,
      'The median-rank regression (a cross-check) uses only the 4 lives seen from their installation: median ranks have no form for delayed entry.',
    ]);
  });

  it('groups by position in number order, each over its own lives', () => {
    const byPosition = checkedAgainstSchema(buildElementLifeReport(input, { ...window, groupBy: 'position' }));
    expect(byPosition.groups.map((g) => [g.key, g.n, g.events])).toEqual([
      ['position=1', 3, 1], // E1, E3, E5
      ['position=2', 1, 0], // E4
      ['position=3', 1, 1], // E8
    ]);
    // One life, censored: a flat curve and no fit.
    expect(byPosition.groups[1]).toMatchObject({ weibull: null, kmMedianDays: null, reasons: { weibull: 'no-events', kmMedianDays: 'not-reached' } });
  });

  it('without delayed entry (open start) the curve is the plain right-censored one: 5 at risk at 100 d, S = 4/5 (Kaplan & Meier 1958)', () => {
    const open = checkedAgainstSchema(buildElementLifeReport(input, { ...window, from: null }));
    const all = open.groups[0]!;
    expect(all.enteredLate).toBe(0);
    // E2 (183 d, failed) is now in: lives 100✕, 183✕, 184, 243, 306, 547✕.
    expect(all.km[0]).toMatchObject({ tDays: 100, nRisk: 6, nEvents: 1 });
    expect(all.km[0]!.survival).toBeCloseTo(5 / 6, 12);
    const direct = kaplanMeier([547, 183, 306, 243, 184, 100], [true, true, false, false, false, true], 0.9);
    expect(all.km.map((r) => r.survival)).toEqual(direct.rows.map((r) => r.survival));
    expect(open.provenance.windows).toEqual([]);
  });

  it('gives the serials used, sorted, and the window', () => {
    expect(report.provenance).toEqual({
      workOrders: [],
      tags: [],
      windows: [
        {
          from: '2020-01-01T00:00:00.000Z',
          to: '2021-01-01T00:00:00.000Z',
          what: 'element lives overlapping this window: begun before it, entered at their age at its start; followed to their removal or to its end (still in service: censored at the end)',
        },
      ],
      elements: ['E1', 'E3', 'E4', 'E5', 'E8'],
      elementCount: 5,
    });
    expect(report).toMatchObject({ site: 'S', from: '2020-01-01T00:00:00.000Z', to: '2021-01-01T00:00:00.000Z', confidence: 0.9, groupBy: 'all' });
  });

  it(`lists at most ${PROVENANCE_CAP} distinct serials, with their full number`, () => {
    const serials = Array.from({ length: PROVENANCE_CAP + 1 }, (_, i) => `S${String(i).padStart(4, '0')}`);
    const p = serialProvenance([...serials, 'S0000']);
    expect(p.elements).toHaveLength(PROVENANCE_CAP);
    expect(p.elements[0]).toBe('S0000');
    expect(p.elementCount).toBe(PROVENANCE_CAP + 1);
  });
});

describe('degenerate input', () => {
  it('no installs: the all group with n = 0 and every figure null for no-data', () => {
    const report = checkedAgainstSchema(buildElementLifeReport({ site: 'S', places, installs: [] }, window));
    expect(report.groups).toHaveLength(1);
    expect(report.groups[0]).toMatchObject({ key: 'all', n: 0, events: 0, weibull: null, b10Days: null, km: [], medianRankRegression: null });
    expect(report.groups[0]!.reasons).toMatchObject({ weibull: 'no-data', kmMedianDays: 'no-data', kmMedianLowerDays: 'no-data' });
    expect(report.provenance).toMatchObject({ elements: [], elementCount: 0 });
  });

  it('no window (a site without element data): null bounds, no lives, no provenance window', () => {
    const report = checkedAgainstSchema(buildElementLifeReport(input, { ...window, from: null, to: null, groupBy: 'train' }));
    expect(report).toMatchObject({ from: null, to: null, groups: [], windowTreatment: { enteredLate: 0, censoredAtEnd: 0 } });
    expect(report.provenance).toEqual({ workOrders: [], tags: [], windows: [], elements: [], elementCount: 0 });
  });
});
