// The run-status history of tags over a window, read from the derived tables only (stop events, the
// span each import covered, the good-quality hourly rollups): what reliability's operating time and the
// downtime KPI both start from, so no request reads the raw samples.
import { edgeSamples } from '#shared/kpi/run-status.ts';
import type { RunStatusSample } from '#shared/kpi/operating-time.ts';
import type { Db } from '../db/client.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import { lastStopEndsBefore, listStopsOverlapping, type StopRow } from '../db/queries/downtime-events.ts';
import { coverageExtents } from '../db/queries/sample-coverage.ts';
import { goodDataExtents } from '../db/queries/sample-hourly.ts';
import type { TagRow } from '../db/queries/tags.ts';
import { ancestry } from './scope.ts';

/** What is known of one run-status tag over a window, in the form the shared calculations take. */
export interface RunStatusHistory {
  tag: TagRow;
  /** Edge samples inside the window, synthesized from the stop events (see `edgeSamples`). */
  samples: RunStatusSample[];
  /** Carries the state at the window start when the data began before it; null otherwise. */
  priorSample: RunStatusSample | null;
  /** First and last good run-status sample of the tag (any time, not only the window); null without good data. */
  dataFrom: Date | null;
  dataUntil: Date | null;
  /** Stop events sharing time with the window. */
  stops: StopRow[];
}

/**
 * The run-status history of each tag over [from, to), read from the derived tables only: stop events
 * (`downtime_events`), the span each import covered (`sample_coverage`) and the good-quality hourly rollups
 * (`sample_hourly`). The data span of a tag is where both agree: from the later of its first covered
 * instant and its first good hour, to the earlier of its last covered instant and its last good sample.
 * Notes name tags without good data (rows still waiting for refresh are the answer's `warnings`: freshness.ts).
 */
export async function loadRunStatusHistories(
  db: Db,
  tags: readonly TagRow[],
  from: Date,
  to: Date,
): Promise<{ histories: Map<number, RunStatusHistory>; notes: string[] }> {
  const ids = tags.map((t) => t.id);
  const [coverage, good, stops, lastEnds] = await Promise.all([
    coverageExtents(db.$client, ids),
    goodDataExtents(db.$client, ids),
    listStopsOverlapping(db.$client, ids, from, to),
    lastStopEndsBefore(db.$client, ids, from),
  ]);
  const notes: string[] = [];
  const histories = new Map<number, RunStatusHistory>();
  for (const tag of tags) {
    const c = coverage.get(tag.id);
    const g = good.get(tag.id);
    let data: { from: Date; until: Date } | null = null;
    if (g) {
      const dataFrom = c && c.from > g.firstHour ? c.from : g.firstHour;
      const dataUntil = c && c.to < g.lastTs ? c.to : g.lastTs;
      if (dataUntil >= dataFrom) data = { from: dataFrom, until: dataUntil };
    }
    if (!data) notes.push(`${tag.name} has no good-quality run-status data.`);
    const tagStops = stops.filter((s) => s.tagId === tag.id);
    const edges = edgeSamples(tagStops, data, { from, to }, lastEnds.get(tag.id) ?? null);
    histories.set(tag.id, { tag, ...edges, dataFrom: data?.from ?? null, dataUntil: data?.until ?? null, stops: tagStops });
  }
  return { histories, notes };
}

/** The asset's rated permeate flow, or that of its nearest ancestor with one; null when none has a rating. */
export function ratedPermeate(assets: AssetRecord[], asset: AssetRecord): { m3h: number; from: string } | null {
  const rated = ancestry(assets, asset).find((a) => a.ratedPermeateM3h !== null);
  return rated ? { m3h: rated.ratedPermeateM3h!, from: rated.code } : null;
}
