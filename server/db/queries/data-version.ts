import type { Queryable } from './queryable.ts';

const versionSql = `concat_ws(':',
       (select coalesce(max(id), 0) from imports),
       (select coalesce(sum(case when status = 'running' then 0 else 1 end), 0) from imports),
       (select coalesce(extract(epoch from max(updated_at)), 0) from settings),
       (select count(*) from dirty_hours),
       (select coalesce(max(id), 0) from downtime_events))`;

/**
 * The data version — a token that changes whenever what the KPIs read changes: an import lands or
 * fails, settings are written, or refresh drains (or an import adds) dirty hours — and the stored
 * settings rows (key → value), and how many tag-hours of imported samples wait for refresh (all
 * sites), in one round trip prepared once per connection: what every KPI request reads before it
 * looks in the cache.
 */
export async function dataVersionAndSettings(q: Queryable): Promise<{ version: string; stored: Record<string, unknown>; lagTagHours: number }> {
  const { rows } = await q.query<{ v: string; s: Record<string, unknown>; lag: number }>({
    name: 'data-version-and-settings',
    text: `select ${versionSql} as v, (select coalesce(jsonb_object_agg(key, value), '{}'::jsonb) from settings) as s,
           (select coalesce(sum(extract(epoch from to_hour - from_hour) / 3600), 0)::float8 from dirty_hours) as lag`,
  });
  return { version: rows[0].v, stored: rows[0].s, lagTagHours: rows[0].lag };
}
