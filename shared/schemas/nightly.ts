// The nightly run as `osmia nightly --json` prints it and GET /api/nightly-runs lists it (docs/design.md §7).
import { z } from 'zod';
import { count, fraction, hours, m3, money } from './answer.ts';
import { isoInstantSchema, pageShape, pagingQuerySchema } from './common.ts';
import { importKinds, membraneAlertKinds, nightlyRunOutcomes, nightlyTriggers } from './enums.ts';

/**
 * What happened to one file of the inbox. completed, partial and duplicate are the import's own status;
 * already-imported: its content had landed before (a run killed between import and move), so it was moved
 * without importing again; failed: not recognised or refused by the importer (moved to failed/);
 * left-in-inbox: the database could not be reached, so the next run tries again.
 */
export const nightlyFileOutcomes = ['completed', 'partial', 'duplicate', 'already-imported', 'failed', 'left-in-inbox'] as const;
export type NightlyFileOutcome = (typeof nightlyFileOutcomes)[number];

/** The steps of a run, in order (server/jobs/nightly.ts, `nightlySteps`). */
export const nightlyStepNames = ['imports', 'refresh', 'workbooks', 'mail'] as const;
export type NightlyStepName = (typeof nightlyStepNames)[number];

export const nightlyFileSchema = z.object({
  /** The file's name in the inbox. */
  file: z.string(),
  /** The kind its header says; null when the header matches none. */
  kind: z.enum(importKinds).nullable(),
  outcome: z.enum(nightlyFileOutcomes),
  importId: z.number().int().nullable(),
  rowsRead: count,
  rowsRejected: count,
  /** Where the file went, relative to the inbox (done/<date>/… or failed/<date>/…); null while it stays. */
  movedTo: z.string().nullable(),
  /** Why it failed, or how many rows were rejected (also in <file>.reason.txt beside it). */
  reason: z.string().nullable(),
});
export type NightlyFile = z.infer<typeof nightlyFileSchema>;

export const nightlyStepSchema = z.object({
  name: z.enum(nightlyStepNames),
  status: z.enum(['ok', 'failed']),
  startedAt: isoInstantSchema,
  durationMs: count,
  /** One line on what the step did. */
  detail: z.string().nullable(),
  error: z.string().nullable(),
});
export type NightlyStep = z.infer<typeof nightlyStepSchema>;

/** Reliability of the whole site over a window, as GET /api/kpi/reliability answers it. */
const reliabilityFiguresSchema = z.object({
  availability: fraction.nullable(),
  operationalAvailability: fraction.nullable(),
  mtbfHours: hours.nullable(),
  mttrHours: hours.nullable(),
  failures: count,
});

/** The plant's stops over a window, as GET /api/kpi/downtime answers it (`plant`). */
const downtimeFiguresSchema = z.object({
  events: count,
  hours,
  plannedHours: hours,
  unplannedHours: hours,
  lostVolumeM3: m3.nullable(),
  cost: money.nullable(),
  currency: z.string().nullable(),
});

export const digestWindowLabels = ['yesterday', 'last-7-days'] as const;

export const nightlyFiguresSchema = z.object({
  site: z.string(),
  timeZone: z.string(),
  windows: z.array(
    z.object({
      label: z.enum(digestWindowLabels),
      from: isoInstantSchema,
      to: isoInstantSchema,
      reliability: reliabilityFiguresSchema.nullable(),
      downtime: downtimeFiguresSchema.nullable(),
      /** Why a figure is missing (the KPI's own error message), and the answers' freshness warnings. */
      notes: z.array(z.string()),
    }),
  ),
  /** The membrane alerts on each stage's latest point of the last 7 days (GET /api/kpi/performance). */
  alerts: z.array(
    z.object({
      stage: z.string(),
      kind: z.enum(membraneAlertKinds),
      changePct: z.number(),
      thresholdPct: z.number(),
      since: isoInstantSchema,
      message: z.string(),
    }),
  ),
});
export type NightlyFigures = z.infer<typeof nightlyFiguresSchema>;

export const nightlyMailSchema = z.object({
  /** Messages this run put in the outbox. */
  queued: count,
  /** Messages sent by this run (its own and older ones it retried). */
  sent: count,
  /** Messages still in the outbox when the run ended: retried by the next run. */
  waiting: count,
  /** Where mail went (host:port, no credentials), or null when no SMTP server is configured. */
  relay: z.string().nullable(),
  error: z.string().nullable(),
});

export const nightlyRunSchema = z.object({
  id: z.number().int(),
  startedAt: isoInstantSchema,
  finishedAt: isoInstantSchema.nullable(),
  /** Null while the run is under way. */
  outcome: z.enum(nightlyRunOutcomes).nullable(),
  trigger: z.enum(nightlyTriggers),
  host: z.string(),
  pid: z.number().int(),
  inbox: z.string(),
  /** The digest's windows end at midnight starting this day, in each site's zone. */
  reportDate: z.iso.date(),
  files: z.array(nightlyFileSchema),
  steps: z.array(nightlyStepSchema),
  figures: z.array(nightlyFiguresSchema),
  mail: nightlyMailSchema.nullable(),
  error: z.string().nullable(),
});
export type NightlyRun = z.infer<typeof nightlyRunSchema>;

/** GET /api/nightly-runs: newest first. */
export const nightlyRunListQuerySchema = pagingQuerySchema;
export const nightlyRunListSchema = z.object({ runs: z.array(nightlyRunSchema), ...pageShape });
export type NightlyRunList = z.infer<typeof nightlyRunListSchema>;
