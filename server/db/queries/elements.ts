import type { ElementInstall } from '#shared/kpi/element-life-report.ts';
import type { Queryable } from './queryable.ts';

/** An element install as the importer writes it: the shared install without its row id. */
export type ElementValues = Omit<ElementInstall, 'id'>;

export async function listElementValues(q: Queryable, siteId: number): Promise<(ElementValues & { id: number })[]> {
  const { rows } = await q.query<ElementValues & { id: number }>(
    `select id, serial, model, vessel_id as "vesselId", position, installed_at as "installedAt",
            removed_at as "removedAt", removal_reason as "removalReason"
     from elements where site_id = $1`,
    [siteId],
  );
  return rows;
}

export async function upsertElements(q: Queryable, siteId: number, importId: number | null, rows: ElementValues[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 5000) {
    const chunk = rows.slice(i, i + 5000);
    const col = <K extends keyof ElementValues>(k: K) => chunk.map((r) => r[k]);
    await q.query(
      `insert into elements (site_id, import_id, serial, model, vessel_id, position, installed_at, removed_at, removal_reason)
       select $1, $2, * from unnest($3::text[], $4::text[], $5::int[], $6::int[], $7::timestamptz[], $8::timestamptz[], $9::text[])
       on conflict (site_id, serial, installed_at) do update set import_id = excluded.import_id, model = excluded.model,
         vessel_id = excluded.vessel_id, position = excluded.position, removed_at = excluded.removed_at,
         removal_reason = excluded.removal_reason`,
      [siteId, importId, col('serial'), col('model'), col('vesselId'), col('position'), col('installedAt'), col('removedAt'), col('removalReason')],
    );
  }
}

/**
 * The installs of elements in the given vessels (null: every vessel of the site) that were installed before `installedBefore`
 * (every install when null), ordered by serial and install time so answers are stable; as ElementInstall, the input element
 * life and the forecast take (shared/kpi/element-life-report.ts).
 */
export async function listElementInstalls(
  q: Queryable,
  siteId: number,
  vesselIds: readonly number[] | null,
  installedBefore: Date | null,
): Promise<ElementInstall[]> {
  if (vesselIds !== null && vesselIds.length === 0) return [];
  // Times as epoch milliseconds: a number parses faster than a timestamp text, and element life
  // reads every install of the site.
  const { rows } = await q.query<Omit<ElementInstall, 'installedAt' | 'removedAt'> & { installedMs: number; removedMs: number | null }>({
    name: 'element-installs',
    text: `select id, serial, model, vessel_id as "vesselId", position, extract(epoch from installed_at)::float8 * 1000 as "installedMs",
            extract(epoch from removed_at)::float8 * 1000 as "removedMs", removal_reason as "removalReason"
     from elements
     where site_id = $1 and ($2::int[] is null or vessel_id = any($2::int[])) and ($3::timestamptz is null or installed_at < $3)
     order by serial, installed_at`,
    values: [siteId, vesselIds, installedBefore],
  });
  return rows.map((r) => ({
    id: r.id,
    serial: r.serial,
    model: r.model,
    vesselId: r.vesselId,
    position: r.position,
    installedAt: new Date(r.installedMs),
    removedAt: r.removedMs === null ? null : new Date(r.removedMs),
    removalReason: r.removalReason,
  }));
}
