import type { Queryable } from './queryable.ts';

export interface SiteRow {
  id: number;
  code: string;
  name: string;
  timeZone: string;
}

const columns = 'id, code, name, time_zone as "timeZone"';

export async function listSites(q: Queryable): Promise<SiteRow[]> {
  return (await q.query<SiteRow>({ name: 'sites', text: `select ${columns} from sites order by code` })).rows;
}

export async function findSite(q: Queryable, code: string): Promise<SiteRow | undefined> {
  return (await q.query<SiteRow>({ name: 'site-by-code', text: `select ${columns} from sites where lower(code) = lower($1)`, values: [code] })).rows[0];
}

export async function insertSite(q: Queryable, site: { code: string; name: string; timeZone: string }): Promise<SiteRow> {
  const { rows } = await q.query<SiteRow>(
    `insert into sites (code, name, time_zone) values ($1, $2, $3)
     on conflict (code) do update set code = excluded.code returning ${columns}`,
    [site.code, site.name, site.timeZone],
  );
  return rows[0];
}
