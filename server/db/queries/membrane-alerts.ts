import type { MembraneAlertKind } from '#shared/schemas/enums.ts';
import type { Queryable } from './queryable.ts';

export interface OpenAlert {
  id: number;
  stage: string;
  kind: MembraneAlertKind;
}

export async function listOpenAlerts(q: Queryable, siteId: number): Promise<OpenAlert[]> {
  const { rows } = await q.query<OpenAlert>(`select id, stage, kind from membrane_alerts where site_id = $1 and cleared_at is null`, [siteId]);
  return rows;
}

/** Opens an alert and answers its id; null when one is open already for the stage and kind. */
export async function openAlert(
  q: Queryable,
  v: { siteId: number; stage: string; kind: MembraneAlertKind; crossedAt: Date; changePct: number; thresholdPct: number; nightlyRunId: number },
): Promise<number | null> {
  const { rows } = await q.query<{ id: number }>(
    `insert into membrane_alerts (site_id, stage, kind, crossed_at, change_pct, threshold_pct, nightly_run_id)
     values ($1, $2, $3, $4, $5, $6, $7) on conflict (site_id, stage, kind) where cleared_at is null do nothing returning id`,
    [v.siteId, v.stage, v.kind, v.crossedAt, v.changePct, v.thresholdPct, v.nightlyRunId],
  );
  return rows[0]?.id ?? null;
}

export async function touchAlerts(q: Queryable, ids: number[]): Promise<void> {
  if (ids.length) await q.query(`update membrane_alerts set last_seen_at = now() where id = any($1)`, [ids]);
}

export async function clearAlerts(q: Queryable, ids: number[]): Promise<void> {
  if (ids.length) await q.query(`update membrane_alerts set cleared_at = now() where id = any($1)`, [ids]);
}

/** Alerts first seen after `since`, for the digest's "what changed". */
export async function alertsDetectedSince(q: Queryable, siteId: number, since: Date): Promise<{ stage: string; kind: MembraneAlertKind; changePct: number; detectedAt: Date }[]> {
  const { rows } = await q.query<{ stage: string; kind: MembraneAlertKind; changePct: number; detectedAt: Date }>(
    `select stage, kind, change_pct as "changePct", detected_at as "detectedAt" from membrane_alerts
      where site_id = $1 and detected_at > $2 order by detected_at, stage, kind`,
    [siteId, since],
  );
  return rows;
}
