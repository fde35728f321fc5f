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
