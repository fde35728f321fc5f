// The replacement forecast answer (docs/design.md §6, §7) from plain rows: the elements in service at the
// start, their ages, the Weibull fit of their group (the same lives and window rule as element life,
// element-life-report.ts), the next calendar months in the site's time zone, the pooled fit of a group
// without its own, notes, cautions and provenance. server/services/forecast.ts reads the rows; the
// maths is in forecast.ts and element-life.ts.
import { TZDate } from '@date-fns/tz';
import { vesselWorkCautions } from '#shared/cautions.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { ForecastQuery, ForecastReport } from '#shared/schemas/forecast.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import {
  compareGroupKeys,
  elementGroupKey,
  groupLives,
  observeLives,
  serialProvenance,
  weibullOut,
  windowTreatmentOf,
  type ElementInstall,
  type ElementLifeReportInput,
  type ElementLifeObservation,
} from './element-life-report.ts';
import { fitWeibull, weibullConfidenceRegion, type WeibullFitResult } from './element-life.ts';
import { forecastBandMethod, forecastReplacements, type ForecastElement, type ForecastPeriod } from './forecast.ts';

const DAY_MS = 86_400_000;

/** In-service elements listed per group at most (highest probability first); the count is in `inService`. */
export const forecastElementListCap = 500;

/** What the forecast is computed from: the element life input and the site's time zone (for the months). */
export interface ForecastReportInput extends ElementLifeReportInput {
  /** IANA zone of the site. */
  timeZone: string;
}

/**
 * The resolved window [from, to) of the fits (null bounds: the site has no element data), the query's
 * options, and `now`: the forecast start when there is no window end.
 */
export type ForecastWindow = { from: Date | null; to: Date | null; now: Date } & Pick<ForecastQuery, 'confidence' | 'groupBy' | 'months' | 'renewal'>;

export type ForecastAnswer = BeforeFreshness<ForecastReport>;

/**
 * Forecast periods from `asOf`: when `asOf` is not the first instant of a calendar month in the
 * site's zone, the rest of its month comes first (marked partial), then `months` whole calendar
 * months. Month bounds are local midnights of the 1st, so a month is 28–31 days of real time, and a
 * daylight-saving month is an hour shorter or longer.
 */
export function forecastMonths(asOf: Date, months: number, timeZone: string): Array<ForecastPeriod & { partial: boolean }> {
  const local = new TZDate(asOf.getTime(), timeZone);
  const monthStart = (offset: number) => new TZDate(local.getFullYear(), local.getMonth() + offset, 1, timeZone);
  const label = (d: TZDate) => `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}`;
  const periods: Array<ForecastPeriod & { partial: boolean }> = [];
  const aligned = monthStart(0).getTime() === asOf.getTime();
  if (!aligned) periods.push({ label: label(local), start: asOf, end: new Date(monthStart(1).getTime()), partial: true });
  const first = aligned ? 0 : 1;
  for (let k = first; k < first + months; k++) {
    const start = monthStart(k);
    periods.push({ label: label(start), start: new Date(start.getTime()), end: new Date(monthStart(k + 1).getTime()), partial: false });
  }
  return periods;
}

/**
 * Elements in service at `asOf`: installed before it and not removed before it — however long before
 * the window they were installed. A removal at `asOf` itself is in service still, as `observeLives`
 * censors a removal at or after the window's end.
 */
export function inServiceAt(installs: readonly ElementInstall[], asOf: Date): ElementInstall[] {
  return installs.filter((e) => e.installedAt < asOf && (e.removedAt === null || e.removedAt >= asOf));
}

/** A Weibull fit and the lives it was fitted to (for its confidence region). */
export interface FitData {
  result: WeibullFitResult;
  times: number[];
  events: boolean[];
  /** Entry ages (delayed entry); undefined when every life is seen from installation. */
  entries: number[] | undefined;
}

/** The Weibull ML fit of some lives, with delayed entry when any life entered late (element-life.ts `fitWeibull`). */
export function fitOf(lives: readonly ElementLifeObservation[], confidence: number): FitData {
  const times = lives.map((l) => l.days);
  const events = lives.map((l) => l.event);
  const entries = lives.some((l) => l.entryDays > 0) ? lives.map((l) => l.entryDays) : undefined;
  return { result: fitWeibull(times, events, { confidence, ...(entries ? { entries } : {}) }), times, events, entries };
}

/**
 * Replacement forecast (docs/design.md §6). asOf = the window end `to` (the service's default: the end of
 * the data; `now` when the site has no data); the horizon starts there. For each element in service at
 * asOf (installed before it and not removed before it, whenever it was installed) with age a days at
 * asOf and the Weibull (β, η) of its group (fitted by maximum likelihood to the lives element life
 * reports for the window [from, asOf), same group-by: every life overlapping it, those begun before
 * `from` entering at their age then), the probability of a life-ending event in a month [s, e)
 * after asOf is exp(H(a) − H(a+s))·(1 − exp(H(a+s) − H(a+e))) with H(x) = (x/η)^β; expected count =
 * Σ of those probabilities, expected cost = count × settings.elementUnitCost. Conditional on survival
 * to asOf, the probability within h is 1 − exp((a/η)^β − ((a+h)/η)^β). Band: the range over the
 * likelihood-ratio confidence region of (β, η) at χ²(1) and the query's confidence (profile
 * likelihood; Meeker & Escobar ch. 8, from memory). `renewal` also counts failures of replacements.
 * Months: `forecastMonths` in the site's zone. A group whose own lives give no fit (no events, or every
 * event at the longest age) borrows the pooled fit of every life in scope, and says so (`fitSource`,
 * notes); with no pooled fit either, its elements are not forecast (listed in the notes) rather than
 * shown as zero. Each group lists its `forecastElementListCap` most likely elements. Totals add the
 * groups month by month. Every answer carries the vessel-work cautions: a replacement opens pressure vessels.
 * Degenerate input: no element in service → no groups, totals 0 for every month (noted).
 */
export function buildForecastReport(
  input: ForecastReportInput,
  window: ForecastWindow,
  settings: Pick<Settings, 'elementUnitCost' | 'currency'>,
): ForecastAnswer {
  const { installs, places } = input;
  const { confidence, groupBy } = window;
  const asOf = window.to ?? window.now;
  const lives = observeLives(installs, places, groupBy, window.from, asOf);
  const livesByGroup = groupLives(lives, groupBy);
  // The fit of every life in scope: the 'all' group's own, and what a group without a fit of its own borrows.
  let pooledFit: FitData | undefined;
  const pooled = () => (pooledFit ??= fitOf(lives, confidence));

  const periods = forecastMonths(asOf, window.months, input.timeZone);
  const inService = inServiceAt(installs, asOf);
  const serviceByGroup = new Map<string, ElementInstall[]>();
  for (const e of inService) {
    const key = elementGroupKey(groupBy, e, places.get(e.vesselId)!);
    (serviceByGroup.get(key) ?? serviceByGroup.set(key, []).get(key)!).push(e);
  }

  const lifeTreatment = windowTreatmentOf(lives);
  const windowTreatment = {
    ...lifeTreatment,
    text:
      `The forecast covers the ${inService.length} element(s) in service at the window's end, whenever installed, each at its age then; ` +
      `its months start at the window's end. The Weibull fits: ${lifeTreatment.text}`,
  };
  const notes: string[] = [];
  const groups: ForecastAnswer['groups'] = [];
  const keys = [...new Set([...livesByGroup.keys(), ...serviceByGroup.keys()])].sort(compareGroupKeys);
  for (const key of keys) {
    const elements = serviceByGroup.get(key) ?? [];
    const own = key === 'all' ? pooled() : fitOf(livesByGroup.get(key) ?? [], confidence);
    const usePooled = own.result.fit === null && key !== 'all' && pooled().result.fit !== null;
    const chosen = usePooled ? pooled() : own;
    if (chosen.result.fit === null) {
      if (elements.length > 0) {
        notes.push(
          `${key}: ${elements.length} element(s) in service are not forecast — no Weibull fit (${own.result.reason}` +
            `${key === 'all' ? '' : `; pooled: ${pooled().result.reason}`}).`,
        );
      }
      continue;
    }
    if (usePooled) {
      notes.push(`${key}: its own lives give no Weibull fit (${own.result.reason}); the pooled fit of every life in scope is used.`);
    }
    const fit = chosen.result.fit;
    const region = weibullConfidenceRegion(chosen.times, chosen.events, {
      confidence,
      dof: 1,
      ...(chosen.entries ? { entries: chosen.entries } : {}),
    });
    if (region.some((p) => !p.closed)) {
      notes.push(`${key}: the confidence region of the fit does not close (too few events): the band understates the uncertainty.`);
    }
    const forecastElements: ForecastElement[] = elements.map((e) => ({
      id: e.serial,
      ageDays: (asOf.getTime() - e.installedAt.getTime()) / DAY_MS,
      replacementCost: settings.elementUnitCost,
    }));
    const result = forecastReplacements({
      asOf,
      elements: forecastElements,
      periods,
      fit: { shape: fit.shape, scale: fit.scale },
      region: region.map(({ shape, scale }) => ({ shape, scale })),
      renewal: window.renewal,
    });
    const listed = [...result.elements].sort((a, b) => b.probability - a.probability || (a.id < b.id ? -1 : 1));
    if (listed.length > forecastElementListCap) {
      notes.push(`${key}: the ${forecastElementListCap} elements most likely to need replacing are listed, of ${listed.length}.`);
    }
    groups.push({
      key,
      inService: elements.length,
      weibull: weibullOut(fit),
      fitSource: usePooled ? 'pooled' : 'group',
      months: result.periods.map((p, k) => ({
        label: p.label,
        from: p.start.toISOString(),
        to: p.end.toISOString(),
        partial: periods[k]!.partial,
        expectedCount: p.expectedCount,
        expectedCost: p.expectedCost,
        countLower: p.countLower,
        countUpper: p.countUpper,
        costLower: p.costLower,
        costUpper: p.costUpper,
      })),
      total: result.total,
      elements: listed
        .slice(0, forecastElementListCap)
        .map((e) => ({ serial: e.id, ageDays: e.ageDays, probability: Math.min(1, Math.max(0, e.probability)) })),
    });
  }
  if (inService.length === 0) notes.push('No element is in service at the forecast start in this scope.');
  notes.push(windowTreatment.text);

  const totals = periods.map((p, k) => ({
    label: p.label,
    from: p.start.toISOString(),
    to: p.end.toISOString(),
    expectedCount: groups.reduce((s, g) => s + g.months[k]!.expectedCount, 0),
    expectedCost: groups.reduce((s, g) => s + g.months[k]!.expectedCost, 0),
  }));
  const horizonEnd = periods[periods.length - 1]!.end;
  const provenance: ForecastAnswer['provenance'] = {
    workOrders: [],
    tags: [],
    windows: [
      ...(window.from ? [{ from: window.from.toISOString(), to: asOf.toISOString(), what: 'element lives used for the fits' }] : []),
      { from: asOf.toISOString(), to: horizonEnd.toISOString(), what: 'forecast horizon' },
    ],
    ...serialProvenance(inService.map((e) => e.serial)),
  };
  return {
    site: input.site,
    asOf: asOf.toISOString(),
    confidence,
    groupBy,
    currency: settings.currency,
    renewal: window.renewal,
    bandMethod: forecastBandMethod,
    groups,
    totals,
    inService: inService.length,
    windowTreatment,
    cautions: [...vesselWorkCautions],
    notes,
    provenance,
  };
}
