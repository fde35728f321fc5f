// How current a site's derived tables are, and the newest data a KPI answer could use.
import type { Queryable } from './queryable.ts';

export interface DerivedLag {
  /** Tags of the site with imported hours still waiting for their rollups and stop events. */
  tags: number;
  /** Those waiting hours summed over the tags (tag-hours): the size of the refresh still to do. */
  tagHours: number;
}

/** The hours of a site's tags that imports queued for refresh (dirty_hours) and refresh has not rebuilt yet. */
export async function derivedLag(q: Queryable, siteCode: string): Promise<DerivedLag> {
  const { rows } = await q.query<{ tags: number; tag_hours: number }>({
    name: 'derived-lag',
    text: `select count(distinct d.tag_id)::int as tags,
              coalesce(sum(extract(epoch from d.to_hour - d.from_hour) / 3600), 0)::float8 as tag_hours
           from dirty_hours d join tags g on g.id = d.tag_id join sites s on s.id = g.site_id
           where s.code = $1`,
    values: [siteCode],
  });
  return { tags: rows[0]?.tags ?? 0, tagHours: rows[0]?.tag_hours ?? 0 };
}

/**
 * The newest good sample in the site's hourly rollups and the newest work-order time (reported,
 * completed or back in service), each before `until` (the window is half-open); null when there is
 * none. The sample is the one the KPIs can use — it lags the import while derived data does (the
 * answer then says so). Indexes only: one rollup row per tag (sample_hourly_key, read backwards) and
 * the work_orders_site_* indexes.
 */
export async function newestData(q: Queryable, siteCode: string, until: Date | null): Promise<{ sample: Date | null; workOrder: Date | null }> {
  const { rows } = await q.query<{ sample: Date | null; work_order: Date | null }>({
    name: 'newest-data',
    text: `with s as (select id from sites where code = $1),
                bound as (select coalesce($2::timestamptz, 'infinity'::timestamptz) as t)
           select
             (select max(least(h.last_ts, (select t from bound) - interval '1 microsecond'))
              from tags g cross join lateral (
                select last_ts from sample_hourly where tag_id = g.id and hour < (select t from bound) order by hour desc limit 1) h
              where g.site_id = (select id from s)) as sample,
             greatest(
               (select max(reported_at) from work_orders where site_id = (select id from s) and reported_at < (select t from bound)),
               (select max(greatest(reported_at, completed_at, out_of_service_to)) from work_orders
                where site_id = (select id from s) and greatest(reported_at, completed_at, out_of_service_to) < (select t from bound))
             ) as work_order`,
    values: [siteCode, until],
  });
  return { sample: rows[0]?.sample ?? null, workOrder: rows[0]?.work_order ?? null };
}
