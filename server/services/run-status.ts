// The run-status rows of tags over a window, read from the derived tables only (stop events, the span
// each import covered, the good-quality hourly rollups): what reliability's operating time and the
// downtime KPI both start from, so no request reads the raw samples. The rules that turn them into a
// history are shared/kpi/run-status.ts's.
import { runStatusHistory, type RunStatusHistory as TagHistory, type RunStatusRows } from '#shared/kpi/run-status.ts';
import type { Db } from '../db/client.ts';
import { lastStopEndsBefore, listStopsOverlapping, type StopRow } from '../db/queries/downtime-events.ts';
import { coverageExtents } from '../db/queries/sample-coverage.ts';
import { goodDataExtents } from '../db/queries/sample-hourly.ts';
import type { TagRow } from '../db/queries/tags.ts';

/** What is known of one run-status tag over a window (`runStatusHistory`), with the tag it is of. */
export interface RunStatusHistory extends TagHistory<StopRow> {
  tag: TagRow;
}

/**
 * The derived rows of each tag over [from, to), by tag id: stop events (`downtime_events`), the span
 * each import covered (`sample_coverage`) and the extent of the good-quality hourly rollups (`sample_hourly`).
 */
export async function loadRunStatusRows(
  db: Db,
  tags: readonly TagRow[],
  from: Date,
  to: Date,
): Promise<Map<number, RunStatusRows<StopRow>>> {
  const ids = tags.map((t) => t.id);
  const [coverage, good, stops, lastEnds] = await Promise.all([
    coverageExtents(db.$client, ids),
    goodDataExtents(db.$client, ids),
    listStopsOverlapping(db.$client, ids, from, to),
    lastStopEndsBefore(db.$client, ids, from),
  ]);
  const rows = new Map<number, RunStatusRows<StopRow>>();
  for (const tag of tags) {
    rows.set(tag.id, {
      coverage: coverage.get(tag.id) ?? null,
      good: good.get(tag.id) ?? null,
      stops: stops.filter((s) => s.tagId === tag.id),
      lastStopEndBefore: lastEnds.get(tag.id) ?? null,
    });
  }
  return rows;
}

/**
 * The run-status history of each tag over [from, to): its derived rows (`loadRunStatusRows`) through
 * `runStatusHistory` (shared/kpi/run-status.ts: the data span where coverage and rollups agree, and the
 * edge samples of its stops). Notes name tags without good data.
 */
export async function loadRunStatusHistories(
  db: Db,
  tags: readonly TagRow[],
  from: Date,
  to: Date,
): Promise<{ histories: Map<number, RunStatusHistory>; notes: string[] }> {
  const rows = await loadRunStatusRows(db, tags, from, to);
  const notes: string[] = [];
  const histories = new Map<number, RunStatusHistory>();
  for (const tag of tags) {
    const { history, note } = runStatusHistory(tag.name, rows.get(tag.id)!, { from, to });
    if (note) notes.push(note);
    histories.set(tag.id, { tag, ...history });
  }
  return { histories, notes };
}
