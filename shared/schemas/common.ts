import { z } from 'zod';

/**
 * C0 and C1 control characters and DEL. A NUL byte cannot be stored in a PostgreSQL text column
 * (the insert fails), and the others have no business in a code, a name or an e-mail: every text
 * field of the API and the CLI goes through one of the fragments below, so such input is a 400
 * naming the field instead of a failed write.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const controlCharacters = /[\u0000-\u001F\u007F-\u009F]/;
/** The same, except tab, line feed and carriage return, for text that may span lines. */
// eslint-disable-next-line no-control-regex -- as above
const controlCharactersExceptLineBreaks = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;
export const controlCharacterMessage = 'must not contain control characters (such as a NUL byte or a line break)';

/** A string on one line: no control characters at all (a password: kept as typed). Chain .min(), .max() after it. */
export const singleLineTextSchema = z.string().refine((s) => !controlCharacters.test(s), { message: controlCharacterMessage });

/** The same after trimming, so a tab or line break pasted around a code or an e-mail is dropped, not refused. */
export const trimmedLineSchema = z
  .string()
  .trim()
  .refine((s) => !controlCharacters.test(s), { message: controlCharacterMessage });

/** A string that may hold tabs and line breaks, but no other control character. */
export const multiLineTextSchema = z
  .string()
  .refine((s) => !controlCharactersExceptLineBreaks.test(s), { message: 'must not contain control characters (such as a NUL byte)' });

/** Largest value of a PostgreSQL `integer` (serial) column. */
export const maxSerialId = 2_147_483_647;

/** A row id in a path (`/api/imports/:id`): a positive integer that fits the id column, else a 400. */
export const idSchema = z.coerce
  .number({ error: 'id must be a positive whole number.' })
  .int('id must be a positive whole number.')
  .positive('id must be a positive whole number.')
  .max(maxSerialId, `id must be at most ${maxSerialId}.`);

/** Is `zone` an IANA time zone this runtime knows (`Europe/Berlin`, `UTC`)? */
export function isKnownTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** An IANA time zone name, checked against the runtime's zone database. */
export const timeZoneSchema = trimmedLineSchema
  .min(1)
  .max(64)
  .refine(isKnownTimeZone, { error: (issue) => `unknown time zone "${String(issue.input)}" (expected an IANA name such as Europe/Berlin or UTC)` });

/**
 * An ISO 8601 calendar date (`2025-03-01`) or date-time with or without an offset
 * (`2025-03-01T06:00`, `2025-03-01T06:00:00Z`, `2025-03-01T06:00:00+01:00`). Kept as the raw string:
 * the server resolves a bare date or a naive date-time in the site's time zone (docs/design.md §6), which a
 * schema shared with the browser cannot know.
 */
/** An ISO 8601 calendar date, `2025-03-01`: what the pages' date pickers and addresses hold. */
export const isoDateSchema = z.iso.date();

export const isoDateOrDateTimeSchema = z.union([isoDateSchema, z.iso.datetime({ offset: true, local: true })], {
  error: 'Give an ISO 8601 date (2025-03-01) or date-time (2025-03-01T06:00:00+01:00).',
});

/** An instant in an answer: ISO 8601 date-time with `Z` or an offset. */
export const isoInstantSchema = z.iso.datetime({ offset: true });

/**
 * Bounds of a confidence level. Below 0.5 an interval says less than a coin toss; above 0.999 the
 * chi-square and normal quantiles of the bounds run into the limits of double precision (at
 * 0.9999999999999999 they are no longer finite), so the answer would be noise, not a bound.
 */
export const confidenceBounds = { min: 0.5, max: 0.999 } as const;
const confidenceMessage = `confidence must be a number from ${confidenceBounds.min} to ${confidenceBounds.max}, e.g. 0.9.`;

/** A confidence level as a number (the plant setting; answers echo it). */
export const confidenceLevelSchema = z
  .number({ error: confidenceMessage })
  .min(confidenceBounds.min, confidenceMessage)
  .max(confidenceBounds.max, confidenceMessage);

/**
 * Confidence level of interval estimates, default 0.9 (docs/design.md §6). Coerced, so the query string
 * `confidence=0.95` and the CLI's `--confidence 0.95` both arrive as numbers.
 */
export const confidenceSchema = z.coerce
  .number({ error: confidenceMessage })
  .min(confidenceBounds.min, confidenceMessage)
  .max(confidenceBounds.max, confidenceMessage)
  .default(0.9);

/** A site or asset code in a query: one line, trimmed, at most 40 characters (the register's limit is 40). */
export const codeQuerySchema = trimmedLineSchema.min(1).max(40, 'a code has at most 40 characters');

/**
 * The window and filters every KPI query starts from: site and asset codes, the half-open window
 * [from, to) (each optional; the default is the whole range of the data) and the confidence level.
 * Endpoints extend it with their own fields (`groupBy`, …).
 */
export const windowQuerySchema = z.object({
  site: codeQuerySchema.optional(),
  asset: codeQuerySchema.optional(),
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

/** A page of a long list (`?limit=20&offset=40`): at most 100 rows at a time, newest first by the list's own order. */
export const pagingQuerySchema = z.object({
  limit: z.coerce.number({ error: 'limit must be a whole number.' }).int('limit must be a whole number.').min(1, 'limit must be at least 1.').max(100, 'limit must be at most 100.').default(20),
  offset: z.coerce.number({ error: 'offset must be a whole number.' }).int('offset must be a whole number.').min(0, 'offset must be 0 or more.').max(maxSerialId).default(0),
});
export type PagingQuery = z.infer<typeof pagingQuerySchema>;

/** What a paged list answers beside its rows: how many there are in all, and which page this is. */
export const pageShape = { total: z.number().int().nonnegative(), limit: z.number().int().positive(), offset: z.number().int().nonnegative() };
