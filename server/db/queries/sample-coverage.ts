// Which span of each tag has samples, per import: read instead of the samples table itself.
import type { Queryable } from './queryable.ts';

/** The first and last sample instant any import brought for a tag (samples of every quality). */
export interface CoverageExtent {
  tagId: number;
  from: Date;
  to: Date;
}

export async function coverageExtents(q: Queryable, tagIds: readonly number[]): Promise<Map<number, CoverageExtent>> {
  if (tagIds.length === 0) return new Map();
  const { rows } = await q.query<CoverageExtent>(
    `select tag_id as "tagId", min(from_ts) as "from", max(to_ts) as "to" from sample_coverage
     where tag_id = any($1::int[]) group by tag_id`,
    [tagIds],
  );
  return new Map(rows.map((r) => [r.tagId, r]));
}
