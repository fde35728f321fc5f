import type { Queryable } from './queryable.ts';

/**
 * A token that changes whenever what the KPIs read changes: an import lands or fails, settings are
 * written, or refresh drains (or an import adds) dirty hours. One cheap round trip.
 */
export async function dataVersion(q: Queryable): Promise<string> {
  const { rows } = await q.query<{ v: string }>(
    `select concat_ws(':',
       (select coalesce(max(id), 0) from imports),
       (select coalesce(sum(case when status = 'running' then 0 else 1 end), 0) from imports),
       (select coalesce(extract(epoch from max(updated_at)), 0) from settings),
       (select count(*) from dirty_hours),
       (select coalesce(max(id), 0) from downtime_events)) as v`,
  );
  return rows[0].v;
}
