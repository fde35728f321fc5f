// The element life answer (docs/design.md §6, §7) from plain rows: which installs a window observes and
// how (docs/decisions/002-element-life-window.md), the group of each life, the survival figures of each
// group, the notes and the provenance. server/services/element-life.ts reads the rows; the survival maths
// is in element-life.ts. The replacement forecast (forecast-report.ts) observes the same lives.
import type { NullReason } from '#shared/schemas/answer.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { ElementLifeQuery, ElementLifeReport } from '#shared/schemas/element-life.ts';
import { lifeEndingReasons } from '#shared/schemas/enums.ts';
import { fitWeibull, kaplanMeier, weibullLifeStats, weibullMedianRankRegression, type WeibullFit } from './element-life.ts';
import { PROVENANCE_CAP } from './provenance.ts';

const DAY_MS = 86_400_000;

/** One element install with its place (server/db/queries/elements.ts reads them). */
export interface ElementInstall {
  id: number;
  serial: string;
  model: string;
  vesselId: number;
  position: number;
  installedAt: Date;
  /** null while in service. */
  removedAt: Date | null;
  /** Why it was removed (shared/schemas/enums.ts removal reasons); null while in service. */
  removalReason: string | null;
}

/** Where a vessel sits: its own code and the codes of the stage and train above it. */
export interface VesselPlace {
  vessel: string;
  stage: string | null;
  train: string | null;
}

/** Everything an element life answer is computed from, as plain rows. */
export interface ElementLifeReportInput {
  /** Site code. */
  site: string;
  /** The vessels in scope (the asset asked about and below it, or the site), by asset id. */
  places: ReadonlyMap<number, VesselPlace>;
  /** The installs in those vessels made before the window's end (every one, without a window end). */
  installs: readonly ElementInstall[];
}

/** The resolved window [from, to) (null bounds: the site has no element data) and the query's options. */
export type ElementLifeWindow = { from: Date | null; to: Date | null } & Pick<ElementLifeQuery, 'confidence' | 'groupBy'>;

export type ElementLifeAnswer = BeforeFreshness<ElementLifeReport>;
export type ElementGroupBy = ElementLifeQuery['groupBy'];
type ElementLifeGroup = ElementLifeReport['groups'][number];
type WeibullOut = NonNullable<ElementLifeGroup['weibull']>;
export type WindowTreatment = ElementLifeReport['windowTreatment'];

/** One element life as the survival maths sees it. */
export interface ElementLifeObservation {
  serial: string;
  install: ElementInstall;
  key: string;
  /** Days from installation to removal, or to the window end when it was still in service then. */
  days: number;
  /**
   * Age in days at which the window first sees the life: its age at `from` when it was installed
   * before `from` (delayed entry), else 0. Always below `days`.
   */
  entryDays: number;
  /** true when the removal reason ends a life (failed, performance, damaged). */
  event: boolean;
  /** true when still in service at `to`, or removed at or after it: censored at its age at `to`. */
  censoredAtEnd: boolean;
}

/**
 * Group key of an element (docs/design.md §6): `all`, `train=T1`, `stage=T1-S1`, `position=1`, `model=…`.
 * A vessel with no stage or train above it falls in `stage=(none)` / `train=(none)`.
 */
export function elementGroupKey(groupBy: ElementGroupBy, install: ElementInstall, place: VesselPlace): string {
  switch (groupBy) {
    case 'all':
      return 'all';
    case 'train':
      return `train=${place.train ?? '(none)'}`;
    case 'stage':
      return `stage=${place.stage ?? '(none)'}`;
    case 'position':
      return `position=${install.position}`;
    case 'model':
      return `model=${install.model}`;
  }
}

/** 'all' first, then positions in number order, other keys in text order. */
export function compareGroupKeys(a: string, b: string): number {
  const pa = /^position=(\d+)$/.exec(a);
  const pb = /^position=(\d+)$/.exec(b);
  if (pa && pb) return Number(pa[1]) - Number(pb[1]);
  if (a === 'all' || b === 'all') return a === 'all' ? (b === 'all' ? 0 : -1) : 1;
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * The lives the window [from, to) lets us observe: every element life that overlaps it.
 * - Installed before `to`; installed before `from` only if still in service after `from` (a life
 *   removed at or before `from` has no time at risk in the window and is left out).
 * - A life installed before `from` enters at its age at `from` (`entryDays`): delayed entry, so the
 *   survival maths counts it at risk only from that age and the Weibull fit conditions on its
 *   surviving to it (left truncation; Klein & Moeschberger, Survival Analysis, 2nd ed., ch. 4).
 *   Why not drop those lives: an element installed before the window and failing in it is exactly
 *   what a window of the last year should see. Why not start them at 0: their survival to `from`
 *   was never at stake in the window, and counting it would bias the lives long.
 * - A removal at or after `to` has not happened yet as far as the window knows: that life is
 *   censored at its age at `to`, as is one still in service. A removal in [from, to) is a
 *   life-ending event when its reason is failed, performance or damaged, and a censoring (planned,
 *   relocated, sampled, none) otherwise.
 * - An install in a vessel not in `places` is left out.
 * A null `from` is open: every life enters at 0. So does every life when `from` is the start of the
 * data (the default window), which gives the plain right-censored answer.
 */
export function observeLives(
  installs: readonly ElementInstall[],
  places: ReadonlyMap<number, VesselPlace>,
  groupBy: ElementGroupBy,
  from: Date | null,
  to: Date,
): ElementLifeObservation[] {
  const lifeEnding = new Set<string>(lifeEndingReasons);
  const out: ElementLifeObservation[] = [];
  for (const install of installs) {
    const place = places.get(install.vesselId);
    if (!place) continue;
    if (install.installedAt >= to) continue;
    const late = from !== null && install.installedAt < from;
    if (late && install.removedAt !== null && install.removedAt <= from) continue;
    const removedInWindow = install.removedAt !== null && install.removedAt < to;
    const end = removedInWindow ? install.removedAt! : to;
    out.push({
      serial: install.serial,
      install,
      key: elementGroupKey(groupBy, install, place),
      days: (end.getTime() - install.installedAt.getTime()) / DAY_MS,
      // end > from for a late life, so entryDays < days.
      entryDays: late ? (from.getTime() - install.installedAt.getTime()) / DAY_MS : 0,
      event: removedInWindow && install.removalReason !== null && lifeEnding.has(install.removalReason),
      censoredAtEnd: !removedInWindow,
    });
  }
  return out;
}

/** How many lives crossed the window's edges, and the sentence that says how they were treated. */
export function windowTreatmentOf(lives: readonly ElementLifeObservation[]): WindowTreatment {
  const enteredLate = lives.filter((l) => l.entryDays > 0).length;
  const censoredAtEnd = lives.filter((l) => l.censoredAtEnd).length;
  const lifeWord = (n: number) => (n === 1 ? 'life' : 'lives');
  const start =
    enteredLate > 0
      ? `Every element life overlapping the window is used (${lives.length}). ${enteredLate} ${lifeWord(enteredLate)} began before the window's start ` +
        'and enter at their age then: they count at risk only from that age on, and the Weibull fit takes their survival to it as given ' +
        '(delayed entry, left truncation). Lives that ended before the window are left out.'
      : `Every element life in the window (${lives.length}) is observed from its installation.`;
  const end =
    censoredAtEnd > 0
      ? ` ${censoredAtEnd} ${censoredAtEnd === 1 ? 'was' : 'were'} still in service at the window's end (or removed later) and ${censoredAtEnd === 1 ? 'is' : 'are'} censored at ${censoredAtEnd === 1 ? 'its age' : 'their age'} then.`
      : '';
  return { enteredLate, censoredAtEnd, text: `${start}${end} Events are the failed, performance and damaged removals inside the window.` };
}

/** Lives grouped by key, groups in key order; with groupBy all, the `all` group is always there. */
export function groupLives(lives: readonly ElementLifeObservation[], groupBy: ElementGroupBy): Map<string, ElementLifeObservation[]> {
  const groups = new Map<string, ElementLifeObservation[]>();
  if (groupBy === 'all') groups.set('all', []);
  for (const life of lives) (groups.get(life.key) ?? groups.set(life.key, []).get(life.key)!).push(life);
  return new Map([...groups].sort(([a], [b]) => compareGroupKeys(a, b)));
}

/** The fit in the answer's units and names (days). */
export function weibullOut(fit: WeibullFit): WeibullOut {
  return {
    shape: fit.shape,
    scaleDays: fit.scale,
    shapeLower: fit.shapeLower,
    shapeUpper: fit.shapeUpper,
    scaleLowerDays: fit.scaleLower,
    scaleUpperDays: fit.scaleUpper,
    logLik: fit.logLik,
    intervalMethod: fit.intervalMethod,
  };
}

/** Serial numbers for provenance: distinct, sorted, at most `PROVENANCE_CAP`, with the count. */
export function serialProvenance(serials: readonly string[]): { elements: string[]; elementCount: number } {
  const distinct = [...new Set(serials)].sort();
  return { elements: distinct.slice(0, PROVENANCE_CAP), elementCount: distinct.length };
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/**
 * Survival figures of one group of lives (days): n, events, Kaplan–Meier with Greenwood log-transformed
 * bounds and its median (delayed entry in the risk sets when any life entered late), the Weibull ML fit
 * with B10, median and mean, and the median-rank regression of the lives seen from installation.
 * Degenerate input: no lives → null figures ('no-data'); no events → null fit ('no-events'), KM median
 * 'not-reached'. Never NaN: a mean beyond a double is null ('unbounded').
 */
export function elementLifeGroup(key: string, lives: readonly ElementLifeObservation[], confidence: number): ElementLifeGroup {
  const times = lives.map((l) => l.days);
  const events = lives.map((l) => l.event);
  const enteredLate = lives.filter((l) => l.entryDays > 0).length;
  // Without late entries, no entry ages at all: the plain right-censored computation, unchanged.
  const entries = enteredLate > 0 ? lives.map((l) => l.entryDays) : undefined;
  const reasons: Record<string, NullReason> = {};
  const km = kaplanMeier(times, events, confidence, entries);
  const result = fitWeibull(times, events, { confidence, ...(entries ? { entries } : {}) });
  let weibull: ElementLifeGroup['weibull'] = null;
  let b10Days: number | null = null;
  let medianDays: number | null = null;
  let meanDays: number | null = null;
  if (result.fit === null) {
    for (const k of ['weibull', 'b10Days', 'medianDays', 'meanDays']) reasons[k] = result.reason;
  } else {
    weibull = weibullOut(result.fit);
    if (result.fit.upperReason) reasons['weibull'] = result.fit.upperReason;
    const stats = weibullLifeStats(result.fit);
    // Γ(1 + 1/β) overflows a double for a shape below about 0.006: the mean is then beyond reach.
    b10Days = finiteOrNull(stats.b10);
    medianDays = finiteOrNull(stats.median);
    meanDays = finiteOrNull(stats.mean);
    if (b10Days === null) reasons['b10Days'] = 'unbounded';
    if (medianDays === null) reasons['medianDays'] = 'unbounded';
    if (meanDays === null) reasons['meanDays'] = 'unbounded';
  }
  if (km.median === null) reasons['kmMedianDays'] = km.reason ?? 'not-reached';
  if (km.medianLower === null) reasons['kmMedianLowerDays'] = km.rows.length === 0 ? 'no-data' : 'not-reached';
  if (km.medianUpper === null) reasons['kmMedianUpperDays'] = km.rows.length === 0 ? 'no-data' : 'not-reached';
  // Median ranks have no delayed-entry form: the regression uses the lives seen from installation.
  const fromInstall = enteredLate > 0 ? lives.filter((l) => l.entryDays === 0) : lives;
  const mrr = weibullMedianRankRegression(
    fromInstall.map((l) => l.days),
    fromInstall.map((l) => l.event),
  );
  let medianRankRegression: ElementLifeGroup['medianRankRegression'] = null;
  if (mrr.fit === null) reasons['medianRankRegression'] = mrr.reason;
  else if (mrr.fit.yOnX.shape > 0 && mrr.fit.xOnY.shape > 0) {
    medianRankRegression = {
      yOnX: { shape: mrr.fit.yOnX.shape, scaleDays: mrr.fit.yOnX.scale },
      xOnY: { shape: mrr.fit.xOnY.shape, scaleDays: mrr.fit.xOnY.scale },
      // A perfect line can come out as 1 + 1e-16 in floating point.
      correlation: Math.max(-1, Math.min(1, mrr.fit.correlation)),
    };
  } else reasons['medianRankRegression'] = 'too-few-events';
  return {
    key,
    n: lives.length,
    events: events.filter(Boolean).length,
    enteredLate,
    weibull,
    b10Days,
    medianDays,
    meanDays,
    kmMedianDays: km.median,
    kmMedianLowerDays: km.medianLower,
    kmMedianUpperDays: km.medianUpper,
    km: km.rows.map((row) => ({
      tDays: row.t,
      survival: row.survival,
      nRisk: row.nRisk,
      nEvents: row.nEvents,
      nCensored: row.nCensored,
      se: row.se,
      lower: row.lower,
      upper: row.upper,
    })),
    medianRankRegression,
    ...(Object.keys(reasons).length > 0 ? { reasons } : {}),
  };
}

/**
 * Element life by group (docs/design.md §6). For each element install in the vessels of the scope:
 * life = removal − installation in days (real elapsed time), a life-ending event when the removal
 * reason is failed, performance or damaged, else censored; the window rule is `observeLives`'s
 * (every life overlapping [from, to); one begun before `from` enters at its age then, one still
 * running at `to` is censored there; `windowTreatment` and `notes` say how many). Per group
 * (`elementLifeGroup`): n, events, Kaplan–Meier survival with Greenwood log-transformed bounds and its
 * median (Kaplan & Meier 1958, as R survival::survfit; risk sets with delayed entry, Klein & Moeschberger
 * ch. 4), a two-parameter Weibull fitted by maximum likelihood with right censoring and left truncation
 * and likelihood-ratio intervals at the query's confidence (NIST/SEMATECH e-Handbook §8.4.1.2;
 * Lawless ch. 5), B10 = η(−ln 0.9)^{1/β}, median = η(ln 2)^{1/β}, mean = ηΓ(1 + 1/β) in days, and a
 * median-rank regression (Bernard ranks, Johnson's adjustment) of the lives seen from installation
 * for comparison.
 * Degenerate input: no elements, or no window end (a site without element data) → the `all` group
 * (with groupBy all) with n = 0 and null figures ('no-data'); all censored → null fit ('no-events') with
 * the KM curve flat at 1 ('not-reached'); every event at the longest age → null fit ('shape-diverges').
 * Never NaN. Provenance: element serials (at most `PROVENANCE_CAP`, `elementCount` gives the full number)
 * and the window used.
 */
export function buildElementLifeReport(input: ElementLifeReportInput, window: ElementLifeWindow): ElementLifeAnswer {
  const { from, to, groupBy, confidence } = window;
  const lives = to === null ? [] : observeLives(input.installs, input.places, groupBy, from, to);
  const groups = [...groupLives(lives, groupBy)].map(([key, list]) => elementLifeGroup(key, list, confidence));
  const windowTreatment = windowTreatmentOf(lives);
  const notes = [windowTreatment.text];
  if (windowTreatment.enteredLate > 0) {
    notes.push(
      `The median-rank regression (a cross-check) uses only the ${lives.length - windowTreatment.enteredLate} lives seen from their installation: median ranks have no form for delayed entry.`,
    );
  }
  const provenance: ElementLifeAnswer['provenance'] = {
    workOrders: [],
    tags: [],
    windows:
      from && to
        ? [
            {
              from: from.toISOString(),
              to: to.toISOString(),
              what:
                'element lives overlapping this window: begun before it, entered at their age at its start; followed to their removal or to its end (still in service: censored at the end)',
            },
          ]
        : [],
    ...serialProvenance(lives.map((l) => l.serial)),
  };
  return {
    site: input.site,
    from: from?.toISOString() ?? null,
    to: to?.toISOString() ?? null,
    confidence,
    groupBy,
    groups,
    windowTreatment,
    notes,
    provenance,
  };
}
