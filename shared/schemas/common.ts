import { z } from 'zod';

/**
 * An ISO 8601 calendar date (`2025-03-01`) or date-time with or without an offset
 * (`2025-03-01T06:00`, `2025-03-01T06:00:00Z`, `2025-03-01T06:00:00+01:00`). Kept as the raw string:
 * the server resolves a bare date or a naive date-time in the site's time zone (DESIGN §6), which a
 * schema shared with the browser cannot know.
 */
export const isoDateOrDateTimeSchema = z.union([z.iso.date(), z.iso.datetime({ offset: true, local: true })], {
  error: 'Give an ISO 8601 date (2025-03-01) or date-time (2025-03-01T06:00:00+01:00).',
});

/** An instant in an answer: ISO 8601 date-time with `Z` or an offset. */
export const isoInstantSchema = z.iso.datetime({ offset: true });

/**
 * Confidence level of interval estimates, a fraction in (0, 1), default 0.9 (DESIGN §6). Coerced, so
 * the query string `confidence=0.95` and the CLI's `--confidence 0.95` both arrive as numbers.
 */
export const confidenceSchema = z.coerce
  .number({ error: 'confidence must be a number between 0 and 1, e.g. 0.9.' })
  .gt(0, 'confidence must be greater than 0.')
  .lt(1, 'confidence must be less than 1.')
  .default(0.9);

/**
 * The window and filters every KPI query starts from: site and asset codes, the half-open window
 * [from, to) (each optional; the default is the whole range of the data) and the confidence level.
 * Endpoints extend it with their own fields (`groupBy`, …).
 */
export const windowQuerySchema = z.object({
  site: z.string().trim().min(1).optional(),
  asset: z.string().trim().min(1).optional(),
  from: isoDateOrDateTimeSchema.optional(),
  to: isoDateOrDateTimeSchema.optional(),
  confidence: confidenceSchema,
});
export type WindowQuery = z.infer<typeof windowQuerySchema>;

/**
 * How fresh a KPI answer is (every KPI answer carries it). `dataAsOf`: the newest historian sample and
 * the newest work-order time of the site the answer could use — at or before the window's end; null
 * when there is none. `derivedUpToDate`: false when samples were imported whose hourly rollups and stop
 * events (what the historian KPIs read) are not rebuilt yet; always true for a KPI that reads none.
 * `warnings`: what a reader must know before trusting the figures, each naming what to do (empty when
 * there is nothing to say). The CLI prints them on stderr, the pages as a banner.
 */
export const freshnessShape = {
  dataAsOf: z.object({
    newestSampleAt: isoInstantSchema.nullable(),
    newestWorkOrderAt: isoInstantSchema.nullable(),
  }),
  derivedUpToDate: z.boolean(),
  warnings: z.array(z.string()),
};
export const freshnessSchema = z.object(freshnessShape);
export type Freshness = z.infer<typeof freshnessSchema>;

/** A KPI answer as its service computes it, before the freshness fields are added (server/services/freshness.ts). */
export type BeforeFreshness<T> = Omit<T, keyof Freshness>;

/** A KPI answer schema without its freshness fields: what a service's own answer is checked against. */
export function beforeFreshnessSchema<Shape extends z.ZodRawShape>(schema: z.ZodObject<Shape>) {
  const mask = { dataAsOf: true, derivedUpToDate: true, warnings: true } as const;
  return schema.omit(mask as never) as unknown as z.ZodObject<{ [K in Exclude<keyof Shape, keyof Freshness>]: Shape[K] }>;
}
