// Query and answer of the time to complete KPI (GET /api/kpi/time-to-complete, `osmia kpi time-to-complete --json`).
import { z } from 'zod';

import { count, hours, nullReasonSchema, provenanceSchema } from './answer.ts';
import { freshnessShape, isoInstantSchema, windowQuerySchema } from './common.ts';

export const quantileMethodType7 = 'type7 (Hyndman & Fan 1996; R default)' as const;

// Time to complete

export const timeToCompleteGroupByValues = ['all', 'guided', 'crew', 'procedure'] as const;

/** GET /api/kpi/time-to-complete. groupBy limits the groups listed beyond `all` (default: every kind). */
export const timeToCompleteQuerySchema = windowQuerySchema.extend({
  groupBy: z.enum(timeToCompleteGroupByValues).optional(),
});
export type TimeToCompleteQuery = z.infer<typeof timeToCompleteQuerySchema>;

export const timeToCompleteGroupSchema = z.object({
  /** 'all', 'guided=yes', 'guided=no', 'crew=…' or 'procedure=…'. */
  key: z.string().regex(/^(all|guided=(yes|no)|crew=.+|procedure=.+)$/),
  n: count,
  meanHours: hours.nullable(),
  medianHours: hours.nullable(),
  p90Hours: hours.nullable(),
  /** Sample standard deviation (n − 1); null below two jobs. */
  sdHours: hours.nullable(),
  minHours: hours.nullable(),
  maxHours: hours.nullable(),
  /** Why the figures are null (a group without jobs); absent when they are not. */
  reason: nullReasonSchema.optional(),
});

export const jobSchema = z.object({
  woNumber: z.string(),
  startedAt: isoInstantSchema,
  completedAt: isoInstantSchema,
  hours: z.number().positive(),
  guided: z.boolean(),
  steps: z.number().int().positive(),
  crew: z.string().nullable(),
  procedure: z.string().nullable(),
});

const learningBucketSchema = z.object({
  label: z.string(),
  /** Period buckets: the period's bounds; sequence buckets: first and last job's start. */
  start: isoInstantSchema.nullable(),
  end: isoInstantSchema.nullable(),
  /** Sequence buckets only: 1-based numbers of the first and last job in start order. */
  firstJob: z.number().int().positive().optional(),
  lastJob: z.number().int().positive().optional(),
  n: count,
  medianHours: hours.nullable(),
  meanHours: hours.nullable(),
});

export const timeToCompleteReportSchema = z.object({
  site: z.string(),
  ...freshnessShape,
  from: isoInstantSchema.nullable(),
  to: isoInstantSchema.nullable(),
  quantileMethod: z.literal(quantileMethodType7),
  groups: z.array(timeToCompleteGroupSchema),
  jobs: z.array(jobSchema),
  /** Jobs left out, with why: a duration that is not positive, or an invalid time. */
  skipped: z.array(z.object({ woNumber: z.string(), reason: z.enum(['non-positive-duration', 'invalid-time']) })),
  learningCurve: z.object({ byPeriod: z.array(learningBucketSchema), bySequence: z.array(learningBucketSchema) }),
  /** How a job's procedure is named. */
  procedureDefinition: z.string(),
  /** Element-replacement jobs are vessel work: the usual cautions (shared/cautions.ts). */
  cautions: z.array(z.string()),
  provenance: provenanceSchema,
});
export type TimeToCompleteReport = z.infer<typeof timeToCompleteReportSchema>;
