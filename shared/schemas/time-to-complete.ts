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
  key: z.string().regex(/^(all|guided=(yes|no)|crew=.+|procedure=.+)$/),
  n: count,
  meanHours: hours.nullable(),
  medianHours: hours.nullable(),
  p90Hours: hours.nullable(),
  sdHours: hours.nullable().optional(),
  minHours: hours.nullable().optional(),
  maxHours: hours.nullable().optional(),
  reason: nullReasonSchema.optional(),
});

export const jobSchema = z.object({
  woNumber: z.string(),
  startedAt: isoInstantSchema,
  completedAt: isoInstantSchema,
  hours: z.number().positive(),
  guided: z.boolean(),
  steps: z.number().int().positive().optional(),
  crew: z.string().nullable().optional(),
  procedure: z.string().nullable().optional(),
});

const learningBucketSchema = z.object({
  label: z.string(),
  start: isoInstantSchema.nullable(),
  end: isoInstantSchema.nullable(),
  firstJob: z.number().int().positive().optional(),
  lastJob: z.number().int().positive().optional(),
  n: count,
  medianHours: hours.nullable(),
  meanHours: hours.nullable(),
});

export const timeToCompleteReportSchema = z.object({
  site: z.string().optional(),
  ...freshnessShape,
  from: isoInstantSchema.nullable().optional(),
  to: isoInstantSchema.nullable().optional(),
  quantileMethod: z.literal(quantileMethodType7),
  groups: z.array(timeToCompleteGroupSchema),
  jobs: z.array(jobSchema),
  skipped: z
    .array(z.object({ woNumber: z.string(), reason: z.enum(['non-positive-duration', 'invalid-time']) }))
    .optional(),
  learningCurve: z
    .object({ byPeriod: z.array(learningBucketSchema), bySequence: z.array(learningBucketSchema) })
    .optional(),
  /** How a job's procedure is named. */
  procedureDefinition: z.string().optional(),
  /** Element-replacement jobs are vessel work: the usual cautions (shared/cautions.ts). */
  cautions: z.array(z.string()).optional(),
  provenance: provenanceSchema.optional(),
});
export type TimeToCompleteReport = z.infer<typeof timeToCompleteReportSchema>;
