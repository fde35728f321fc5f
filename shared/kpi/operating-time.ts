// Operating time T of an asset over a half-open window [from, to) (docs/design.md §6).
//
// Two computations; the caller decides which applies (its own run-status tag, else the nearest
// ancestor's, else the calendar fallback) and passes the matching `source`:
// - from run-status samples: a state (1 running, 0 stopped) holds from its sample until the next good
//   sample; before the first sample the state is unknown unless the last sample before the window is given;
// - calendar time less the union of out-of-service windows, when no run-status tag exists.
// All arithmetic is on UTC instants (epoch milliseconds), so a daylight-saving change neither adds
// nor removes an hour: durations are real elapsed time.

export const MS_PER_HOUR = 3_600_000;

/** A good-quality run-status sample (the caller drops uncertain and bad ones): 1 running, 0 stopped. */
export interface RunStatusSample {
  time: Date;
  value: number;
}

/** Half-open window [from, to). */
export interface TimeWindow {
  from: Date;
  to: Date;
}

/** An interval in epoch milliseconds, half-open [fromMs, toMs). */
export interface MsInterval {
  fromMs: number;
  toMs: number;
}

/** An interval as it appears in answers: ISO 8601 UTC instants and its length in hours. */
export interface TimeInterval {
  from: string;
  to: string;
  hours: number;
}

export type RunState = 'running' | 'stopped' | 'unknown';

export interface StateSpan extends MsInterval {
  state: RunState;
}

export type OperatingTimeSource = 'run-status' | 'ancestor-run-status' | 'calendar-less-out-of-service';

/** An out-of-service window of a work order; `to: null` means still out of service (open to the window end). */
export interface OutOfServiceWindow {
  from: Date;
  to: Date | null;
  /** Provenance, e.g. the work-order number. */
  ref?: string;
}

export interface OperatingTimeResult {
  /** Operating (running) hours in the window. */
  hours: number;
  source: OperatingTimeSource;
  /** The run-status tag used; null for the calendar fallback. */
  tag: string | null;
  from: string;
  to: string;
  windowHours: number;
  uptimeHours: number;
  downtimeHours: number;
  /** Hours whose state is not known (before the first sample with no earlier sample given). */
  unknownHours: number;
  uptime: TimeInterval[];
  downtime: TimeInterval[];
  unknown: TimeInterval[];
  /** Share of the window whose state is known, 0–1; null for an empty window. */
  coverage: number | null;
  coverageNullReason: string | null;
  /** Provenance of the calendar fallback: the out-of-service windows that were subtracted. */
  outOfServiceRefs: string[];
  notes: string[];
}

/** Epoch milliseconds of a Date, refusing an invalid one with a message naming the field. */
export function instantMs(value: Date, what: string): number {
  const ms = validMs(value);
  if (Number.isNaN(ms)) throw instantError(value, what);
  return ms;
}

/** `value` in milliseconds, NaN when it is not a valid Date: the hot paths' check, naming the value only on error. */
export function validMs(value: Date): number {
  return value instanceof Date ? value.getTime() : Number.NaN;
}

/** The error for a value `validMs` found wrong, named `what`. */
export function instantError(value: unknown, what: string): Error {
  return value instanceof Date ? new RangeError(`${what} is not a valid date`) : new TypeError(`${what} must be a Date`);
}

/** Validates a window and returns it in milliseconds; `from` after `to` is an error, equal is an empty window. */
export function windowMs(window: TimeWindow): MsInterval {
  const fromMs = instantMs(window.from, 'window.from');
  const toMs = instantMs(window.to, 'window.to');
  if (fromMs > toMs) {
    throw new RangeError(
      `invalid-window: window.from (${window.from.toISOString()}) is after window.to (${window.to.toISOString()})`,
    );
  }
  return { fromMs, toMs };
}

export function hoursBetween(fromMs: number, toMs: number): number {
  return (toMs - fromMs) / MS_PER_HOUR;
}

export function toTimeInterval(interval: MsInterval): TimeInterval {
  return {
    from: new Date(interval.fromMs).toISOString(),
    to: new Date(interval.toMs).toISOString(),
    hours: hoursBetween(interval.fromMs, interval.toMs),
  };
}

/**
 * Union of intervals: sorted by start, overlapping or touching intervals merged, empty ones dropped.
 * Units: epoch milliseconds in and out. Degenerate input: [] → [].
 */
export function mergeIntervals(intervals: readonly MsInterval[]): MsInterval[] {
  const sorted = intervals.filter((i) => i.toMs > i.fromMs).sort((a, b) => a.fromMs - b.fromMs);
  const merged: MsInterval[] = [];
  for (const interval of sorted) {
    const last = merged[merged.length - 1];
    if (last && interval.fromMs <= last.toMs) {
      last.toMs = Math.max(last.toMs, interval.toMs);
    } else {
      merged.push({ fromMs: interval.fromMs, toMs: interval.toMs });
    }
  }
  return merged;
}

/** Intersection of an interval with a window; null when they share no time. */
export function clipInterval(interval: MsInterval, window: MsInterval): MsInterval | null {
  const fromMs = Math.max(interval.fromMs, window.fromMs);
  const toMs = Math.min(interval.toMs, window.toMs);
  return toMs > fromMs ? { fromMs, toMs } : null;
}

/** Length in milliseconds of the time two intervals share (0 when disjoint or only touching). */
export function overlapMs(a: MsInterval, b: MsInterval): number {
  return Math.max(0, Math.min(a.toMs, b.toMs) - Math.max(a.fromMs, b.fromMs));
}

function checkedSample(sample: RunStatusSample, what: string | number): { ms: number; running: boolean } {
  // `what`: the sample's index in `samples`, or its name; the message is built only on error.
  const name = () => (typeof what === 'number' ? `samples[${what}]` : what);
  const ms = validMs(sample.time);
  if (Number.isNaN(ms)) throw instantError(sample.time, `${name()}.time`);
  if (sample.value !== 0 && sample.value !== 1) {
    throw new RangeError(`${name()}.value must be 1 (running) or 0 (stopped), got ${String(sample.value)}`);
  }
  return { ms, running: sample.value === 1 };
}

/**
 * Splits the window into running / stopped / unknown spans from good run-status samples.
 *
 * A state holds from its sample until the next sample. The state at the window start is that of the last
 * sample before it (from `samples` or `priorSample`, whichever is later); with none it is unknown until
 * the first sample in the window. Samples at or after `to` are ignored. Samples with the same instant:
 * the last one in input order wins. `stateBeforeWindow` is the state carried into the window from earlier
 * samples ('unknown' with none). Units: epoch milliseconds. Degenerate input: no samples and no prior
 * sample → one unknown span covering the window; an empty window → no spans.
 */
export function runStateSpans(
  samples: readonly RunStatusSample[],
  window: TimeWindow,
  priorSample?: RunStatusSample | null,
): { spans: StateSpan[]; notes: string[]; stateBeforeWindow: RunState } {
  const w = windowMs(window);
  const notes: string[] = [];
  const checked = samples.map((s, i) => checkedSample(s, i));
  if (priorSample) {
    const prior = checkedSample(priorSample, 'priorSample');
    if (prior.ms >= w.fromMs) {
      throw new RangeError('priorSample must be earlier than window.from (it gives the state at the window start)');
    }
    checked.unshift(prior);
  }
  // Stable sort: samples sharing an instant keep input order, so the last one given wins.
  const sorted = checked.map((s, i) => ({ ...s, i })).sort((a, b) => a.ms - b.ms || a.i - b.i);

  let state: RunState = 'unknown';
  for (const s of sorted) {
    if (s.ms < w.fromMs) state = s.running ? 'running' : 'stopped';
  }
  const stateBeforeWindow = state;
  const inWindow = sorted.filter((s) => s.ms >= w.fromMs && s.ms < w.toMs);
  if (w.toMs === w.fromMs) return { spans: [], notes, stateBeforeWindow };
  if (state === 'unknown') {
    if (inWindow.length === 0) {
      notes.push('No good run-status sample in or before the window: the state is unknown and no time is counted.');
    } else if (inWindow[0]!.ms > w.fromMs) {
      const hours = hoursBetween(w.fromMs, inWindow[0]!.ms);
      notes.push(
        `No run-status sample before the window: the first ${round(hours)} h (until ${new Date(inWindow[0]!.ms).toISOString()}) ` +
          'are of unknown state and not counted.',
      );
    }
  }

  const spans: StateSpan[] = [];
  const push = (fromMs: number, toMs: number, s: RunState) => {
    if (toMs <= fromMs) return;
    const last = spans[spans.length - 1];
    if (last && last.state === s && last.toMs === fromMs) last.toMs = toMs;
    else spans.push({ fromMs, toMs, state: s });
  };
  let cursor = w.fromMs;
  for (const s of inWindow) {
    push(cursor, s.ms, state);
    cursor = s.ms;
    state = s.running ? 'running' : 'stopped';
  }
  push(cursor, w.toMs, state);
  return { spans, notes, stateBeforeWindow };
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

function sumHours(intervals: readonly MsInterval[]): number {
  return intervals.reduce((acc, i) => acc + hoursBetween(i.fromMs, i.toMs), 0);
}

function coverageOf(windowHours: number, unknownHours: number): { coverage: number | null; reason: string | null } {
  if (windowHours === 0) return { coverage: null, reason: 'The window is empty (from equals to).' };
  return { coverage: (windowHours - unknownHours) / windowHours, reason: null };
}

/**
 * Operating time from a run-status tag: T = total length of the running spans in [from, to), in hours.
 *
 * A state holds until the next good sample; time before the first sample is unknown (not counted) unless
 * `priorSample`, the last good sample before the window, is given. Uptime = running spans, downtime =
 * stopped spans, unknown = the rest. Source: docs/design.md §6 (operating time T); terms as in EN 13306 (up time,
 * down time; from memory). Degenerate input: no samples → 0 h with coverage 0 and a note; empty window →
 * 0 h, coverage null with its reason.
 */
export function operatingTimeFromRunStatus(
  samples: readonly RunStatusSample[],
  window: TimeWindow,
  options: { tag?: string | null; source?: 'run-status' | 'ancestor-run-status'; priorSample?: RunStatusSample | null } = {},
): OperatingTimeResult {
  const w = windowMs(window);
  const { spans, notes } = runStateSpans(samples, window, options.priorSample);
  const uptime = spans.filter((s) => s.state === 'running');
  const downtime = spans.filter((s) => s.state === 'stopped');
  const unknown = spans.filter((s) => s.state === 'unknown');
  const windowHours = hoursBetween(w.fromMs, w.toMs);
  const unknownHours = sumHours(unknown);
  const { coverage, reason } = coverageOf(windowHours, unknownHours);
  const uptimeHours = sumHours(uptime);
  return {
    hours: uptimeHours,
    source: options.source ?? 'run-status',
    tag: options.tag ?? null,
    from: window.from.toISOString(),
    to: window.to.toISOString(),
    windowHours,
    uptimeHours,
    downtimeHours: sumHours(downtime),
    unknownHours,
    uptime: uptime.map(toTimeInterval),
    downtime: downtime.map(toTimeInterval),
    unknown: unknown.map(toTimeInterval),
    coverage,
    coverageNullReason: reason,
    outOfServiceRefs: [],
    notes,
  };
}

/**
 * Fallback operating time when no run-status tag exists on the asset or an ancestor:
 * T = (to − from) − |union of out-of-service windows ∩ [from, to)|, in hours.
 *
 * Overlapping out-of-service windows are merged first, so shared time is subtracted once; a window with
 * `to: null` (still out of service) runs to the window end. Source: docs/design.md §6. Degenerate input: no
 * out-of-service windows → T is the whole window; empty window → 0 h, coverage null with its reason.
 */
export function operatingTimeFromCalendar(
  window: TimeWindow,
  outOfService: readonly OutOfServiceWindow[],
): OperatingTimeResult {
  const w = windowMs(window);
  const notes: string[] = [];
  const refs: string[] = [];
  const intervals: MsInterval[] = [];
  outOfService.forEach((o, i) => {
    const fromMs = instantMs(o.from, `outOfService[${i}].from`);
    const toMs = o.to === null ? w.toMs : instantMs(o.to, `outOfService[${i}].to`);
    if (o.to !== null && toMs < fromMs) {
      throw new RangeError(`outOfService[${i}] ends (${o.to.toISOString()}) before it starts (${o.from.toISOString()})`);
    }
    const clipped = clipInterval({ fromMs, toMs }, w);
    if (!clipped) return;
    if (o.to === null) notes.push(`Out-of-service window ${o.ref ?? `#${i}`} has no end: counted to the window end.`);
    if (o.ref !== undefined) refs.push(o.ref);
    intervals.push(clipped);
  });
  const downtime = mergeIntervals(intervals);
  const uptime: MsInterval[] = [];
  let cursor = w.fromMs;
  for (const d of downtime) {
    if (d.fromMs > cursor) uptime.push({ fromMs: cursor, toMs: d.fromMs });
    cursor = d.toMs;
  }
  if (w.toMs > cursor) uptime.push({ fromMs: cursor, toMs: w.toMs });
  const windowHours = hoursBetween(w.fromMs, w.toMs);
  const downtimeHours = sumHours(downtime);
  const { coverage, reason } = coverageOf(windowHours, 0);
  const uptimeHours = windowHours - downtimeHours;
  return {
    hours: uptimeHours,
    source: 'calendar-less-out-of-service',
    tag: null,
    from: window.from.toISOString(),
    to: window.to.toISOString(),
    windowHours,
    uptimeHours,
    downtimeHours,
    unknownHours: 0,
    uptime: uptime.map(toTimeInterval),
    downtime: downtime.map(toTimeInterval),
    unknown: [],
    coverage,
    coverageNullReason: reason,
    outOfServiceRefs: refs,
    notes,
  };
}
