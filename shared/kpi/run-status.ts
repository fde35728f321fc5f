// Run-status histories as the shared calculations take them (docs/design.md §6, operating time and
// downtime): the stop events that refresh derived, turned back into the edge samples of the state.
import type { RunStatusSample } from './operating-time.ts';

/** A stop of one run-status tag, [from, to); `to` null: still stopped at the end of its data. */
export interface StopInterval {
  from: Date;
  to: Date | null;
}

/**
 * Run-status samples equivalent to a tag's stop events, for the shared functions that take samples
 * (runStateSpans, stopSpans, operatingTimeFromRunStatus).
 *
 * `osmia refresh` has already turned the good samples into stop events [from, to) (to null: still stopped at
 * the end of the data), with docs/design.md §6's rule that a state holds until the next good sample. Inside the
 * window, every stop start becomes a 0 sample and every stop end a 1 sample; where the data starts inside
 * the window, a 1 sample marks its first instant (a stop starting at the same instant overrides it, since
 * the last sample given for an instant wins). Where the data started before the window, `priorSample`
 * carries the state at the window start: 0 at the start of the stop under way then, else 1 at the end of
 * the last earlier stop (or at the first sample). The spans the shared functions rebuild from these samples
 * are exactly the stops and the running time between them; before `dataFrom` the state stays unknown, and
 * callers cut the window at `dataUntil`, after which the state is unknown as well.
 */
export function edgeSamples(
  stops: readonly StopInterval[],
  data: { from: Date; until: Date } | null,
  window: { from: Date; to: Date },
  lastStopEndBefore: Date | null,
): { samples: RunStatusSample[]; priorSample: RunStatusSample | null } {
  if (!data || data.until <= window.from || data.from >= window.to) return { samples: [], priorSample: null };
  const first: RunStatusSample[] = [];
  let priorSample: RunStatusSample | null = null;
  if (data.from < window.from) {
    const under = stops.find((s) => s.from < window.from && (s.to === null || s.to > window.from));
    const restart = lastStopEndBefore && lastStopEndBefore > data.from ? lastStopEndBefore : data.from;
    priorSample = under ? { time: under.from, value: 0 } : { time: restart, value: 1 };
  } else {
    first.push({ time: data.from, value: 1 });
  }
  const ends: RunStatusSample[] = [];
  const starts: RunStatusSample[] = [];
  for (const s of stops) {
    if (s.to !== null && s.to >= window.from && s.to < window.to) ends.push({ time: s.to, value: 1 });
    if (s.from >= window.from && s.from < window.to) starts.push({ time: s.from, value: 0 });
  }
  // Ends before starts: should a stop end where the next begins, the stopped state wins that instant.
  return { samples: [...first, ...ends, ...starts], priorSample };
}

/** What the derived tables hold of one run-status tag, as server/services/run-status.ts reads them. */
export interface RunStatusRows<S extends StopInterval = StopInterval> {
  /** First and last sample instant any import brought for the tag (samples of every quality); null without. */
  coverage: { from: Date; to: Date } | null;
  /** First hour with a good sample and the instant of the last good sample; null without good data. */
  good: { firstHour: Date; lastTs: Date } | null;
  /** Stops sharing time with the window, in time order. */
  stops: readonly S[];
  /** End of the tag's last stop that ended before the window start; null when none did. */
  lastStopEndBefore: Date | null;
}

/** What is known of one run-status tag over a window, in the form the shared calculations take. */
export interface RunStatusHistory<S extends StopInterval = StopInterval> {
  /** Edge samples inside the window, synthesized from the stop events (see `edgeSamples`). */
  samples: RunStatusSample[];
  /** Carries the state at the window start when the data began before it; null otherwise. */
  priorSample: RunStatusSample | null;
  /** First and last good run-status sample of the tag (any time, not only the window); null without good data. */
  dataFrom: Date | null;
  dataUntil: Date | null;
  /** Stop events sharing time with the window. */
  stops: readonly S[];
}

/**
 * The span of a run-status tag's data: where the sample coverage and the good-quality rollups agree,
 * from the later of its first covered instant and its first good hour to the earlier of its last
 * covered instant and its last good sample. Null without good data, or when the two do not overlap.
 */
export function runStatusDataSpan(
  coverage: RunStatusRows['coverage'],
  good: RunStatusRows['good'],
): { from: Date; until: Date } | null {
  if (!good) return null;
  const from = coverage && coverage.from > good.firstHour ? coverage.from : good.firstHour;
  const until = coverage && coverage.to < good.lastTs ? coverage.to : good.lastTs;
  return until >= from ? { from, until } : null;
}

/**
 * The run-status history of one tag over [from, to) from its derived rows: the data span
 * (`runStatusDataSpan`) and the edge samples of its stops (`edgeSamples`). `note` names a tag without
 * good data (rows still waiting for refresh are the answer's `warnings`: server/services/freshness.ts).
 */
export function runStatusHistory<S extends StopInterval>(
  tagName: string,
  rows: RunStatusRows<S>,
  window: { from: Date; to: Date },
): { history: RunStatusHistory<S>; note: string | null } {
  const data = runStatusDataSpan(rows.coverage, rows.good);
  const edges = edgeSamples(rows.stops, data, window, rows.lastStopEndBefore);
  return {
    history: { ...edges, dataFrom: data?.from ?? null, dataUntil: data?.until ?? null, stops: rows.stops },
    note: data ? null : `${tagName} has no good-quality run-status data.`,
  };
}
