import { z } from 'zod';
import { idSchema, multiLineTextSchema, singleLineTextSchema, timeZoneSchema, trimmedLineSchema } from './common.ts';
import { importKinds, importStatuses } from './enums.ts';

export const importKindSchema = z.enum(importKinds);

export const rejectSchema = z.object({ line: z.number().int(), reason: z.string() });
export type Reject = z.infer<typeof rejectSchema>;

/** The import record: what `osmia import --json` prints and GET /api/imports/:id answers (docs/design.md §7). */
export const importRecordSchema = z.object({
  id: z.number().int().nullable(),
  kind: importKindSchema,
  site: z.string().nullable(),
  file: z.string(),
  sha256: z.string(),
  status: z.enum(importStatuses),
  rowsRead: z.number().int(),
  rowsInserted: z.number().int(),
  rowsUpdated: z.number().int(),
  rowsUnchanged: z.number().int(),
  rowsRejected: z.number().int(),
  /** The first rejects (all of them are in GET /api/imports/:id/rejects.csv). */
  rejects: z.array(rejectSchema),
  durationMs: z.number().int(),
  actor: z.string(),
  startedAt: z.string(),
  dryRun: z.boolean(),
  /** What the importer noticed: daylight-saving corrections, ignored columns, formula-like text, units. */
  notes: z.record(z.string(), z.unknown()),
  error: z.string().nullable(),
  /**
   * Whether the tables derived from imported data (hourly rollups, stop events) include this import:
   * true once a refresh ran after it landed — the import's own, unless it was run with --no-refresh, or
   * a later `osmia refresh`. False for a dry run, a duplicate or a failed import (nothing to include).
   */
  derivedRefreshed: z.boolean(),
});
export type ImportRecord = z.infer<typeof importRecordSchema>;


export const importListQuerySchema = z.object({
  kind: importKindSchema.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

export const importIdParamsSchema = z.object({ id: idSchema });

/** Fields of the multipart upload (POST /api/imports) beside the file. */
export const importUploadFieldsSchema = z.object({
  kind: importKindSchema,
  site: trimmedLineSchema.min(1).max(40).optional(),
  /** Checked before anything is written: an unknown zone is a 400, not a failed import record. */
  tz: timeZoneSchema.optional(),
  strict: z
    .enum(['true', 'false', 'on', ''])
    .optional()
    .transform((v) => v === 'true' || v === 'on'),
  dryRun: z
    .enum(['true', 'false', 'on', ''])
    .optional()
    .transform((v) => v === 'true' || v === 'on'),
  /** Column map as JSON: {"Their header": "our_header"}. */
  map: multiLineTextSchema.max(20_000).optional(),
  /** The uploaded file's name as the client sent it (kept in the history). */
  fileName: singleLineTextSchema.min(1).max(255),
});
export type ImportUploadFields = z.infer<typeof importUploadFieldsSchema>;

/** Canonical columns of each kind (docs/design.md §5); historian long/wide are told apart by the header. */
export const importColumns = {
  assets: ['code', 'name', 'kind', 'parent', 'rated_permeate_m3h', 'element_capacity', 'rack_row', 'rack_col'],
  tags: ['tag', 'asset', 'quantity', 'unit'],
  'work-orders': [
    'wo_number',
    'asset',
    'type',
    'priority',
    'status',
    'failure_code',
    'description',
    'reported_at',
    'started_at',
    'completed_at',
    'out_of_service_from',
    'out_of_service_to',
    'labour_hours',
    'labour_cost',
    'parts_cost',
    'crew',
  ],
  elements: ['serial', 'model', 'vessel', 'position', 'installed_at', 'removed_at', 'removal_reason'],
  'job-steps': ['wo_number', 'step', 'name', 'started_at', 'completed_at', 'guided', 'technician'],
  historian: ['timestamp', 'tag', 'value', 'quality'],
} as const;

/** Columns that may be left out of a file; every other canonical column must be present. */
export const optionalColumns: Record<string, readonly string[]> = {
  assets: ['parent', 'rated_permeate_m3h', 'element_capacity', 'rack_row', 'rack_col'],
  tags: ['unit'],
  'work-orders': ['failure_code', 'description', 'started_at', 'completed_at', 'out_of_service_from', 'out_of_service_to', 'labour_hours', 'labour_cost', 'parts_cost', 'crew', 'priority'],
  elements: ['removed_at', 'removal_reason'],
  'job-steps': ['technician', 'guided'],
  historian: ['quality'],
};

export const importProgressSchema = z.object({ bytesRead: z.number(), totalBytes: z.number(), rowsRead: z.number() }).nullable();

/** GET /api/imports: the history, newest first; a running import carries its progress. */
export const importHistorySchema = z.object({
  imports: z.array(importRecordSchema.omit({ rejects: true }).extend({ progress: importProgressSchema })),
});
export type ImportHistory = z.infer<typeof importHistorySchema>;

export const importDetailSchema = importRecordSchema.extend({ progress: importProgressSchema });
export type ImportDetail = z.infer<typeof importDetailSchema>;
