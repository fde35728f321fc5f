// What every KPI answer is made of (GET /api/kpi/<name>, `osmia kpi <name> --json`): the reasons a figure
// is null, the provenance that explains it, and the measures with their units. Each KPI's own query and
// answer live in the file of its name (reliability.ts, downtime.ts, …); window and freshness in common.ts.
// Key names are docs/design.md §7's: camelCase with a unit suffix; the keys listed there may not be
// renamed, further keys may be added.
import { z } from 'zod';

import { isoInstantSchema } from './common.ts';

// Measures the answers are made of: units live in the key names (docs/design.md §7), ratios stay 0–1.
export const hours = z.number().nonnegative();
export const days = z.number().nonnegative();
export const fraction = z.number().min(0).max(1);
/**
 * A share of a whole that the server sums: the server computes it so it cannot pass 1 (whole
 * milliseconds, shared/kpi/downtime.ts), and a reader tolerates the last bits of floating-point
 * rounding rather than refusing a whole page over 1.0000000000000004.
 */
export const share = z.number().min(0).max(1 + 1e-9);
export const count = z.number().int().nonnegative();
export const confidence = z.number().gt(0).lt(1);
export const m3 = z.number().nonnegative();
export const money = z.number().nonnegative();
/** A sentence saying why the figures beside it are null; null when none is. */
export const reason = z.string().nullable();

/** Why a KPI value is null (never NaN or Infinity); sentences in shared/kpi/stats.ts. */
export const nullReasons = [
  'no-data',
  'no-failures',
  'no-events',
  'no-operating-time',
  'no-repairs',
  'no-time',
  'too-few-values',
  'too-few-events',
  'shape-diverges',
  'survival-zero',
  'not-reached',
  'unbounded',
  'no-jobs',
  'no-fit',
] as const;
export type NullReason = (typeof nullReasons)[number];
export const nullReasonSchema = z.enum(nullReasons);

/** For each null figure of an answer, why it is null: `{ "mtbfHours": "no-failures" }`. */
export const reasonsSchema = z.record(z.string(), nullReasonSchema);




/** What a number was computed from, so any figure can be explained (docs/design.md §6, last paragraph). */
export const provenanceSchema = z.object({
  /** External work-order numbers used. */
  workOrders: z.array(z.string()),
  /** Historian tags used. */
  tags: z.array(z.string()),
  /** Time windows used (the KPI window, out-of-service windows, …), ISO instants. */
  windows: z.array(
    z.object({
      from: isoInstantSchema,
      to: isoInstantSchema,
      what: z.string().optional(),
    }),
  ),
  /** Element serial numbers used (element-life, forecast). */
  elements: z.array(z.string()).optional(),
  /** Import ids whose rows were used. */
  imports: z.array(z.union([z.string(), z.number()])).optional(),
  /** Totals when a list above was capped. */
  elementCount: count.optional(),
  workOrderCount: count.optional(),
  /** Trains whose data was used (maintenance mix: produced volume). */
  trains: z.array(z.string()).optional(),
});
export type Provenance = z.infer<typeof provenanceSchema>;
