import type { AssetKind } from '#shared/schemas/enums.ts';
import type { Queryable } from './queryable.ts';

export interface AssetRecord {
  id: number;
  code: string;
  name: string;
  kind: AssetKind;
  parentId: number | null;
  parentCode: string | null;
  ratedPermeateM3h: number | null;
  elementCapacity: number | null;
  rackRow: number | null;
  rackCol: number | null;
}

export async function listAssets(q: Queryable, siteId: number): Promise<AssetRecord[]> {
  const { rows } = await q.query<AssetRecord>({
    name: 'assets-of-site',
    text: `select a.id, a.code, a.name, a.kind, a.parent_id as "parentId", p.code as "parentCode",
            a.rated_permeate_m3h as "ratedPermeateM3h", a.element_capacity as "elementCapacity",
            a.rack_row as "rackRow", a.rack_col as "rackCol"
     from assets a left join assets p on p.id = a.parent_id where a.site_id = $1 order by a.code`,
    values: [siteId],
  });
  return rows;
}

type AssetValues = Omit<AssetRecord, 'id' | 'parentId' | 'parentCode'>;

export async function upsertAssets(q: Queryable, siteId: number, rows: AssetValues[]): Promise<void> {
  if (rows.length === 0) return;
  const col = <K extends keyof AssetValues>(k: K) => rows.map((r) => r[k]);
  await q.query(
    `insert into assets (site_id, code, name, kind, rated_permeate_m3h, element_capacity, rack_row, rack_col)
     select $1, * from unnest($2::text[], $3::text[], $4::text[], $5::float8[], $6::int[], $7::int[], $8::int[])
     on conflict (site_id, code) do update set name = excluded.name, kind = excluded.kind,
       rated_permeate_m3h = excluded.rated_permeate_m3h, element_capacity = excluded.element_capacity,
       rack_row = excluded.rack_row, rack_col = excluded.rack_col`,
    [siteId, col('code'), col('name'), col('kind'), col('ratedPermeateM3h'), col('elementCapacity'), col('rackRow'), col('rackCol')],
  );
}

/** Set each listed asset's parent by code ('' or null clears it). */
export async function setParents(q: Queryable, siteId: number, links: { code: string; parent: string | null }[]): Promise<void> {
  if (links.length === 0) return;
  await q.query(
    `update assets a set parent_id = p.id
     from unnest($2::text[], $3::text[]) as l(code, parent)
     left join assets p on p.site_id = $1 and p.code = l.parent
     where a.site_id = $1 and a.code = l.code`,
    [siteId, links.map((l) => l.code), links.map((l) => l.parent)],
  );
}
