import type { Db } from '../db/client.ts';
import { claimDirtyRanges, hasDirtyHours, markAllDirty, rebuildHourly, rebuildStops, runStatusTags } from '../db/queries/derived.ts';
import { markImportsRefreshed } from '../db/queries/imports.ts';
import { rebuildJobSpans } from '../db/queries/job-steps.ts';
import { summarizeNewSamples } from '../db/queries/samples.ts';

export interface RefreshResult {
  full: boolean;
  tags: number;
  hoursRebuilt: number;
  stopsRebuilt: number;
  /** Job spans rebuilt from the step log (a full refresh only: imports keep them otherwise). */
  jobSpansRebuilt: number;
  durationMs: number;
}

/**
 * Rebuild what is derived from samples (hourly rollups, stop events) for the hours imports touched
 * since the last refresh; with `full`, for all data. One transaction: a crash leaves the claimed
 * ranges queued for the next run, and a second worker skips what the first has claimed. A full
 * refresh also rebuilds the job spans (job_spans), which imports otherwise keep as they go. Landed
 * imports are marked as included in the derived tables (`derivedRefreshed` of the import record).
 */
export async function refresh(db: Db, options: { full?: boolean; log?: (line: string) => void } = {}): Promise<RefreshResult> {
  const t0 = Date.now();
  const client = await db.$client.connect();
  let tags = 0;
  let hoursRebuilt = 0;
  let stopsRebuilt = 0;
  let jobSpansRebuilt = 0;
  try {
    // The BRIN ranges imports filled since the last run: summarized first, so the range scans below
    // read only their own blocks (imports leave this to refresh to stay as fast as a plain COPY). With
    // nothing queued there is no range scan to speed up (autosummarize gets there in the background).
    if (options.full || (await hasDirtyHours(client))) await summarizeNewSamples(client);
    await client.query('begin');
    // Grouping a year of samples by tag and hour is one big hash aggregate: give it room.
    await client.query(`set local work_mem = '256MB'`);
    // Every read below is a time range of the samples, which the BRIN index answers by reading only that
    // range's blocks. The planner misjudges BRIN for ranges past its statistics (new data, gaps) and
    // chose a scan of all 13 M demo rows for a one-hour look back: 0.8 s a query, 3 s for one new day of
    // one tag. A full rebuild reads everything anyway and keeps the planner's choice.
    if (!options.full) await client.query(`set local enable_seqscan = off`);
    if (options.full) {
      await markAllDirty(client);
      jobSpansRebuilt = await rebuildJobSpans(client, null);
    }
    const runTags = await runStatusTags(client);
    await markImportsRefreshed(client);
    const ranges = await claimDirtyRanges(client);
    // Tags imported together share a range: rebuild them in one pass over that range.
    const byRange = new Map<string, { from: Date; to: Date; tagIds: number[] }>();
    for (const r of ranges) {
      const key = `${r.from.toISOString()}/${r.to.toISOString()}`;
      (byRange.get(key) ?? byRange.set(key, { from: r.from, to: r.to, tagIds: [] }).get(key)!).tagIds.push(r.tagId);
    }
    for (const { from, to, tagIds } of byRange.values()) {
      hoursRebuilt += await rebuildHourly(client, tagIds, from, to);
      const run = tagIds.map((id) => runTags.get(id)).filter((r) => r !== undefined);
      stopsRebuilt += await rebuildStops(client, run, from, to);
      tags += tagIds.length;
    }
    await client.query('commit');
  } catch (err) {
    await client.query('rollback').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
  const result = { full: Boolean(options.full), tags, hoursRebuilt, stopsRebuilt, jobSpansRebuilt, durationMs: Date.now() - t0 };
  options.log?.(`refresh: ${tags} tags, ${hoursRebuilt} hourly rollups, ${stopsRebuilt} stops${options.full ? `, ${jobSpansRebuilt} job spans` : ''} in ${(result.durationMs / 1000).toFixed(1)} s`);
  return result;
}
