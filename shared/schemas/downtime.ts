// Query and answer of the downtime KPI (GET /api/kpi/downtime, `osmia kpi downtime --json`).
import { z } from 'zod';

import { count, hours, m3, money, provenanceSchema, share } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

/** GET /api/kpi/downtime: `asset` limits the answer to that asset and the assets below it. */
export const downtimeQuerySchema = windowQuerySchema.extend({});
export type DowntimeQuery = z.infer<typeof downtimeQuerySchema>;

/** docs/design.md §7 keys: asset, from, to, hours, planned, cause, lostVolumeM3. */
export const downtimeEventSchema = z.object({
  asset: z.string(),
  from: isoInstantSchema,
  to: isoInstantSchema,
  hours,
  planned: z.boolean(),
  /** Failure code of the best-overlapping corrective work order, or 'unknown'. */
  cause: z.string(),
  /** Null when the asset has no rated permeate flow. */
  lostVolumeM3: m3.nullable(),
  cost: money.nullable(),
  tag: z.string(),
  clippedAtStart: z.boolean(),
  clippedAtEnd: z.boolean(),
  plannedBy: z.array(z.string()),
  causeWorkOrder: z.string().nullable(),
  causeOverlapHours: hours,
  /** Assets below this one that were stopped during this stop too: counted here, once, not as their own events. */
  alsoStopped: z.array(z.string()),
});

/** What a set of stops adds up to: count, hours (planned and not), lost volume and its cost (null when any stop's is). */
const stopSumsShape = {
  events: count,
  hours,
  plannedHours: hours,
  unplannedHours: hours,
  lostVolumeM3: m3.nullable(),
  cost: money.nullable(),
};

/** docs/design.md §7 keys: asset, events, hours, plannedHours, unplannedHours, lostVolumeM3, cost. */
export const downtimeTotalSchema = z.object({
  asset: z.string(),
  ...stopSumsShape,
  tag: z.string(),
  ratedPermeateM3h: z.number().nonnegative().nullable(),
  /** The asset whose rated permeate flow priced this asset's lost volume (itself or the nearest above it with one). */
  ratedPermeateFrom: z.string().nullable(),
});

export const paretoRowSchema = z.object({
  key: z.string(),
  ...stopSumsShape,
  /** Share of all stop hours, 0–1. */
  share,
  /** Running sum of `share` down the sorted table, 0–1. */
  cumulativeShare: share,
});

export const downtimeReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  from: isoInstantSchema,
  to: isoInstantSchema,
  events: z.array(downtimeEventSchema),
  totals: z.array(downtimeTotalSchema),
  /** Every event once: the totals by asset and both Pareto tables add up to these hours, volume and cost. */
  plant: z.object(stopSumsShape),
  paretoByCause: z.array(paretoRowSchema),
  paretoByAsset: z.array(paretoRowSchema),
  waterValuePerM3: money.nullable(),
  currency: z.string(),
  notes: z.array(z.string()),
  provenance: provenanceSchema,
});
export type DowntimeReport = z.infer<typeof downtimeReportSchema>;
export type DowntimeEvent = z.infer<typeof downtimeEventSchema>;
export type DowntimeTotal = z.infer<typeof downtimeTotalSchema>;
export type ParetoRow = z.infer<typeof paretoRowSchema>;
export type DowntimePlantTotal = DowntimeReport['plant'];
