import type { Quantity } from '#shared/schemas/enums.ts';
import type { Queryable } from './queryable.ts';

export interface TagRow {
  id: number;
  name: string;
  assetId: number;
  assetCode: string;
  quantity: Quantity;
  sourceUnit: string;
}

export async function listTags(q: Queryable, siteId: number): Promise<TagRow[]> {
  const { rows } = await q.query<TagRow>(
    `select t.id, t.name, t.asset_id as "assetId", a.code as "assetCode", t.quantity, t.source_unit as "sourceUnit"
     from tags t join assets a on a.id = t.asset_id where t.site_id = $1 order by t.name`,
    [siteId],
  );
  return rows;
}

export async function upsertTags(
  q: Queryable,
  siteId: number,
  rows: { name: string; assetId: number; quantity: Quantity; sourceUnit: string }[],
): Promise<void> {
  if (rows.length === 0) return;
  await q.query(
    `insert into tags (site_id, name, asset_id, quantity, source_unit)
     select $1, * from unnest($2::text[], $3::int[], $4::text[], $5::text[])
     on conflict (site_id, name) do update set asset_id = excluded.asset_id, quantity = excluded.quantity, source_unit = excluded.source_unit`,
    [siteId, rows.map((r) => r.name), rows.map((r) => r.assetId), rows.map((r) => r.quantity), rows.map((r) => r.sourceUnit)],
  );
}
