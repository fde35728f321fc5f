import { it } from 'vitest';
import { createTestDatabase } from '../../setup/db.ts';
import { seedOpsPlant } from './ops-plant.ts';
it('prints', async () => {
  const t = await createTestDatabase();
  await seedOpsPlant(t.db);
  const ids = (await t.db.$client.query(`select id, name from tags order by name`)).rows;
  console.log(ids);
  const run = ids.find((r) => r.name === 'TR1.RUN').id;
  const req = ids.filter((r) => r.name.startsWith('S1.') && r.name !== 'S1.QC').map((r) => r.id);
  const opt = ids.filter((r) => r.name === 'S1.QC').map((r) => r.id);
  const t0 = Date.now();
  const { rows } = await t.db.$client.query(`explain analyze with running as (
       select hour from sample_hourly
       where tag_id = $1 and hour >= $4::timestamptz and hour <= $5::timestamptz - interval '1 hour' and min >= 1),
     complete as (
       select h.hour from sample_hourly h join running r on r.hour = h.hour
       where h.tag_id = any($2::int[]) and h.hour >= $4::timestamptz and h.hour < $5::timestamptz
       group by h.hour having count(distinct h.tag_id) = cardinality($2::int[]))
     select date_trunc('day', h.hour at time zone $6::text) at time zone $6::text as "day", h.tag_id as "tagId",
            avg(h.mean) as "mean", count(*)::int as "hours"
     from sample_hourly h join complete c on c.hour = h.hour
     where h.tag_id = any($2::int[] || $3::int[]) and h.hour >= $4::timestamptz and h.hour < $5::timestamptz
     group by 1, 2 order by 1, 2`, [run, req, opt, new Date('2025-01-01T00:00:00Z'), new Date('2025-01-08T00:00:00Z'), 'UTC']);
  console.log(rows.map((r) => r['QUERY PLAN']).join('\n'), Date.now() - t0);
  console.log((await t.db.$client.query(`select count(*) from sample_hourly`)).rows);
  await t.close();
});
