// The queue of hours whose rollups and stop events `osmia refresh` has still to rebuild.
import type { Queryable } from './queryable.ts';

/** The tags among `tagIds` with hours still waiting for `osmia refresh`: their derived rows may be stale. */
export async function tagsAwaitingRefresh(q: Queryable, tagIds: readonly number[]): Promise<number[]> {
  if (tagIds.length === 0) return [];
  const { rows } = await q.query<{ tagId: number }>(
    `select distinct tag_id as "tagId" from dirty_hours where tag_id = any($1::int[]) order by 1`,
    [tagIds],
  );
  return rows.map((r) => r.tagId);
}
