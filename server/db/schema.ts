import { sql } from 'drizzle-orm';
import {
  bigserial,
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  serial,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  type AnyPgColumn,
} from 'drizzle-orm/pg-core';
import {
  assetKinds,
  quantities,
  removalReasons,
  roles,
  workOrderPriorities,
  workOrderStatuses,
  workOrderTypes,
  importKinds,
  importStatuses,
  mailKinds,
  membraneAlertKinds,
  nightlyRunOutcomes,
  nightlyTriggers,
} from '#shared/schemas/enums.ts';

// Every instant is a timestamptz: durations are real elapsed time whatever the site's time zone.
const instant = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });
const created = () => instant('created_at').notNull().defaultNow();

/** SQL `col IN ('a','b')` for an enumeration kept as text (cheaper to extend than a pg enum). */
const oneOf = (column: string, values: readonly string[]) =>
  sql.raw(`${column} in (${values.map((v) => `'${v}'`).join(', ')})`);

export const users = pgTable(
  'users',
  {
    id: serial('id').primaryKey(),
    email: text('email').notNull(),
    name: text('name').notNull().default(''),
    passwordHash: text('password_hash').notNull(),
    role: text('role').notNull(),
    disabled: boolean('disabled').notNull().default(false),
    createdAt: created(),
    lastLoginAt: instant('last_login_at'),
    /** Raised by sign-out, a password or role change and disabling: sessions signed before end (auth/session.ts). */
    sessionGeneration: integer('session_generation').notNull().default(0),
    /** Receives the nightly digest and the alert mails its role may read (server/mail/, docs/design.md §2). */
    digest: boolean('digest').notNull().default(false),
  },
  (t) => [
    uniqueIndex('users_email_key').on(sql`lower(${t.email})`),
    check('users_role_check', oneOf('role', roles)),
  ],
);

export const sites = pgTable('sites', {
  id: serial('id').primaryKey(),
  code: text('code').notNull().unique('sites_code_key'),
  name: text('name').notNull(),
  timeZone: text('time_zone').notNull().default('UTC'),
  createdAt: created(),
});

export const assets = pgTable(
  'assets',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    code: text('code').notNull(),
    name: text('name').notNull(),
    kind: text('kind').notNull(),
    parentId: integer('parent_id').references((): AnyPgColumn => assets.id, { onDelete: 'set null' }),
    ratedPermeateM3h: doublePrecision('rated_permeate_m3h'),
    elementCapacity: integer('element_capacity'),
    rackRow: integer('rack_row'),
    rackCol: integer('rack_col'),
  },
  (t) => [
    uniqueIndex('assets_site_code_key').on(t.siteId, t.code),
    index('assets_parent_idx').on(t.parentId),
    check('assets_kind_check', oneOf('kind', assetKinds)),
    check('assets_capacity_check', sql`element_capacity is null or element_capacity between 1 and 16`),
    check('assets_vessel_capacity_check', sql`kind <> 'vessel' or element_capacity is not null`),
    check('assets_rated_check', sql`rated_permeate_m3h is null or rated_permeate_m3h >= 0`),
  ],
);

export const imports = pgTable(
  'imports',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id').references(() => sites.id, { onDelete: 'cascade' }),
    kind: text('kind').notNull(),
    fileName: text('file_name').notNull(),
    sha256: text('sha256').notNull(),
    actor: text('actor').notNull(),
    status: text('status').notNull(),
    rowsRead: integer('rows_read').notNull().default(0),
    rowsInserted: integer('rows_inserted').notNull().default(0),
    rowsUnchanged: integer('rows_unchanged').notNull().default(0),
    rowsRejected: integer('rows_rejected').notNull().default(0),
    durationMs: integer('duration_ms').notNull().default(0),
    options: jsonb('options').notNull().default({}),
    notes: jsonb('notes').notNull().default({}),
    error: text('error'),
    startedAt: instant('started_at').notNull().defaultNow(),
    finishedAt: instant('finished_at'),
  },
  (t) => [
    check('imports_kind_check', oneOf('kind', importKinds)),
    check('imports_status_check', oneOf('status', importStatuses)),
    index('imports_started_idx').on(t.startedAt),
    // One landed import per file content, kind and site: the second run of a file is a "duplicate".
    uniqueIndex('imports_landed_key')
      .on(t.siteId, t.kind, t.sha256)
      .where(sql`status in ('completed', 'partial')`),
  ],
);

export const importRejects = pgTable(
  'import_rejects',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    importId: integer('import_id')
      .notNull()
      .references(() => imports.id, { onDelete: 'cascade' }),
    line: integer('line').notNull(),
    reason: text('reason').notNull(),
    raw: text('raw'),
  },
  (t) => [index('import_rejects_import_idx').on(t.importId, t.line)],
);

export const workOrders = pgTable(
  'work_orders',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    woNumber: text('wo_number').notNull(),
    assetId: integer('asset_id')
      .notNull()
      .references(() => assets.id, { onDelete: 'restrict' }),
    type: text('type').notNull(),
    priority: text('priority').notNull(),
    status: text('status').notNull(),
    failureCode: text('failure_code'),
    description: text('description').notNull().default(''),
    reportedAt: instant('reported_at').notNull(),
    startedAt: instant('started_at'),
    completedAt: instant('completed_at'),
    outOfServiceFrom: instant('out_of_service_from'),
    outOfServiceTo: instant('out_of_service_to'),
    labourHours: doublePrecision('labour_hours').notNull().default(0),
    labourCost: doublePrecision('labour_cost').notNull().default(0),
    partsCost: doublePrecision('parts_cost').notNull().default(0),
    crew: text('crew'),
    importId: integer('import_id').references(() => imports.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('work_orders_site_number_key').on(t.siteId, t.woNumber),
    index('work_orders_asset_reported_idx').on(t.assetId, t.reportedAt),
    // A site's work-order extent (the default KPI window, services/scope.ts): min and max read from
    // the index ends instead of scanning every order.
    index('work_orders_site_reported_idx').on(t.siteId, t.reportedAt),
    index('work_orders_site_last_date_idx').on(t.siteId, sql`greatest(reported_at, completed_at, out_of_service_to)`),
    check('work_orders_type_check', oneOf('type', workOrderTypes)),
    check('work_orders_priority_check', oneOf('priority', workOrderPriorities)),
    check('work_orders_status_check', oneOf('status', workOrderStatuses)),
    check('work_orders_started_check', sql`started_at is null or started_at >= reported_at`),
    check('work_orders_completed_check', sql`completed_at is null or (started_at is not null and completed_at >= started_at)`),
    check(
      'work_orders_oos_check',
      sql`(out_of_service_from is null) = (out_of_service_to is null) and (out_of_service_to is null or out_of_service_to >= out_of_service_from)`,
    ),
    check('work_orders_money_check', sql`labour_hours >= 0 and labour_cost >= 0 and parts_cost >= 0`),
  ],
);

export const jobSteps = pgTable(
  'job_steps',
  {
    id: serial('id').primaryKey(),
    workOrderId: integer('work_order_id')
      .notNull()
      .references(() => workOrders.id, { onDelete: 'cascade' }),
    step: integer('step').notNull(),
    name: text('name').notNull(),
    startedAt: instant('started_at').notNull(),
    completedAt: instant('completed_at').notNull(),
    guided: boolean('guided').notNull(),
    technician: text('technician'),
    importId: integer('import_id').references(() => imports.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('job_steps_wo_step_key').on(t.workOrderId, t.step),
    check('job_steps_step_check', sql`step >= 1`),
    check('job_steps_duration_check', sql`completed_at > started_at`),
  ],
);

/**
 * Each job (a work order with steps) reduced to its span: first step start, last step end, any step
 * guided, step count. Derived from job_steps: written in the same transaction as the steps it sums
 * (importers/registers.ts), rebuilt whole by `osmia refresh --full`. Time to complete reads it
 * instead of grouping every step on each request.
 */
export const jobSpans = pgTable('job_spans', {
  workOrderId: integer('work_order_id')
    .primaryKey()
    .references(() => workOrders.id, { onDelete: 'cascade' }),
  firstStart: instant('first_start').notNull(),
  lastEnd: instant('last_end').notNull(),
  guided: boolean('guided').notNull(),
  steps: integer('steps').notNull(),
});

export const elements = pgTable(
  'elements',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    serial: text('serial').notNull(),
    model: text('model').notNull(),
    vesselId: integer('vessel_id')
      .notNull()
      .references(() => assets.id, { onDelete: 'restrict' }),
    position: integer('position').notNull(),
    installedAt: instant('installed_at').notNull(),
    removedAt: instant('removed_at'),
    removalReason: text('removal_reason'),
    importId: integer('import_id').references(() => imports.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('elements_site_serial_installed_key').on(t.siteId, t.serial, t.installedAt),
    index('elements_vessel_position_idx').on(t.vesselId, t.position, t.installedAt),
    check('elements_position_check', sql`position >= 1`),
    check('elements_removed_check', sql`removed_at is null or removed_at > installed_at`),
    check('elements_reason_check', sql`removal_reason is null or ${oneOf('removal_reason', removalReasons)}`),
  ],
);

export const tags = pgTable(
  'tags',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    assetId: integer('asset_id')
      .notNull()
      .references(() => assets.id, { onDelete: 'restrict' }),
    quantity: text('quantity').notNull(),
    /** The unit of the export; samples are stored converted to the quantity's canonical unit. */
    sourceUnit: text('source_unit').notNull().default(''),
  },
  (t) => [
    uniqueIndex('tags_site_name_key').on(t.siteId, t.name),
    index('tags_asset_idx').on(t.assetId, t.quantity),
    check('tags_quantity_check', oneOf('quantity', quantities)),
  ],
);

/**
 * The big table: tens of millions of rows. Append-only and ordered by time as historian exports are,
 * so a BRIN index on ts is a few pages and keeps COPY at the speed of an unindexed load (a btree on
 * (tag_id, ts) made COPY about 2.7 × slower here). The natural key (tag, ts) is enforced by the
 * importer with sample_coverage, not by a unique index: see docs/decisions/001-samples-storage.md.
 * quality is the OPC DA quality byte (192 good, 64 uncertain, 0 bad).
 */
export const samples = pgTable(
  'samples',
  {
    tagId: integer('tag_id').notNull(),
    ts: instant('ts').notNull(),
    value: doublePrecision('value').notNull(),
    quality: smallint('quality').notNull(),
  },
  // autosummarize: block ranges filled by later COPYs are summarized by autovacuum; refresh also
  // summarizes new ranges before it reads (a range not yet summarized is read by every BRIN scan).
  (t) => [index('samples_ts_brin').using('brin', t.ts).with({ pages_per_range: 16, autosummarize: true })],
);

/** Per import and tag, the span and count of samples it brought: how overlaps are found cheaply. */
export const sampleCoverage = pgTable(
  'sample_coverage',
  {
    importId: integer('import_id')
      .notNull()
      .references(() => imports.id, { onDelete: 'cascade' }),
    tagId: integer('tag_id')
      .notNull()
      .references(() => tags.id, { onDelete: 'cascade' }),
    fromTs: instant('from_ts').notNull(),
    toTs: instant('to_ts').notNull(),
    rows: integer('rows').notNull(),
  },
  (t) => [index('sample_coverage_tag_idx').on(t.tagId, t.fromTs, t.toTs)],
);

/** Hourly rollups of good samples, rebuilt by `osmia refresh` for the hours an import touched. */
export const sampleHourly = pgTable(
  'sample_hourly',
  {
    tagId: integer('tag_id').notNull(),
    hour: instant('hour').notNull(),
    n: integer('n').notNull(),
    mean: doublePrecision('mean').notNull(),
    min: doublePrecision('min').notNull(),
    max: doublePrecision('max').notNull(),
    lastTs: instant('last_ts').notNull(),
  },
  (t) => [uniqueIndex('sample_hourly_key').on(t.tagId, t.hour)],
);

/** Hours whose rollups must be rebuilt: written by imports, drained by refresh. */
export const dirtyHours = pgTable(
  'dirty_hours',
  {
    tagId: integer('tag_id').notNull(),
    fromHour: instant('from_hour').notNull(),
    toHour: instant('to_hour').notNull(),
  },
  (t) => [index('dirty_hours_tag_idx').on(t.tagId)],
);

/** Stop events derived from run-status edges by `osmia refresh`. */
export const downtimeEvents = pgTable(
  'downtime_events',
  {
    id: serial('id').primaryKey(),
    assetId: integer('asset_id')
      .notNull()
      .references(() => assets.id, { onDelete: 'cascade' }),
    tagId: integer('tag_id')
      .notNull()
      .references(() => tags.id, { onDelete: 'cascade' }),
    fromTs: instant('from_ts').notNull(),
    toTs: instant('to_ts'),
  },
  (t) => [uniqueIndex('downtime_events_asset_from_key').on(t.assetId, t.fromTs), index('downtime_events_from_idx').on(t.fromTs)],
);

export const settings = pgTable('settings', {
  key: text('key').primaryKey(),
  value: jsonb('value').notNull(),
  updatedAt: instant('updated_at').notNull().defaultNow(),
  updatedBy: text('updated_by'),
});

/**
 * One row per nightly run (server/jobs/nightly.ts): what it found in the inbox and did with each file,
 * each step's result, and the figures its digest reported. A run killed before it finished keeps
 * `finished_at` null until the next run marks it interrupted.
 */
export const nightlyRuns = pgTable(
  'nightly_runs',
  {
    id: serial('id').primaryKey(),
    startedAt: instant('started_at').notNull().defaultNow(),
    finishedAt: instant('finished_at'),
    /** Null while the run is under way. */
    outcome: text('outcome'),
    trigger: text('trigger').notNull(),
    host: text('host').notNull(),
    pid: integer('pid').notNull(),
    inbox: text('inbox').notNull(),
    /** The day the digest reports up to (its windows end at that day's midnight in the site's zone). */
    reportDate: text('report_date').notNull(),
    files: jsonb('files').notNull().default([]),
    steps: jsonb('steps').notNull().default([]),
    figures: jsonb('figures').notNull().default([]),
    mail: jsonb('mail').notNull().default({}),
    error: text('error'),
  },
  (t) => [
    index('nightly_runs_started_idx').on(t.startedAt),
    check('nightly_runs_outcome_check', sql`outcome is null or ${oneOf('outcome', nightlyRunOutcomes)}`),
    check('nightly_runs_trigger_check', oneOf('trigger', nightlyTriggers)),
  ],
);

/**
 * Mail waiting to be sent, and mail sent (`sent_at`): the nightly run writes every message here first and
 * then sends what is unsent, so a message the SMTP server did not take is retried on the next run.
 * `dedupe_key` keeps one digest per recipient and day and one alert per crossing, also across a run
 * killed and run again.
 */
export const outbox = pgTable(
  'outbox',
  {
    id: serial('id').primaryKey(),
    createdAt: created(),
    kind: text('kind').notNull(),
    dedupeKey: text('dedupe_key').notNull(),
    toAddress: text('to_address').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html').notNull(),
    /** [{filename, path}]: files attached when the message is sent. */
    attachments: jsonb('attachments').notNull().default([]),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    lastAttemptAt: instant('last_attempt_at'),
    sentAt: instant('sent_at'),
    messageId: text('message_id'),
    nightlyRunId: integer('nightly_run_id').references(() => nightlyRuns.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('outbox_dedupe_key').on(t.dedupeKey),
    index('outbox_unsent_idx').on(t.id).where(sql`sent_at is null`),
    index('outbox_recipient_idx').on(t.toAddress, t.kind, t.createdAt),
    check('outbox_kind_check', oneOf('kind', mailKinds)),
  ],
);

/** What the development mail server (server/mail/fake-smtp.ts) received, for the Mail page. */
export const mailMessages = pgTable(
  'mail_messages',
  {
    id: serial('id').primaryKey(),
    receivedAt: instant('received_at').notNull().defaultNow(),
    envelopeFrom: text('envelope_from').notNull(),
    envelopeTo: jsonb('envelope_to').notNull().default([]),
    fromHeader: text('from_header').notNull(),
    toHeader: text('to_header').notNull(),
    subject: text('subject').notNull(),
    messageId: text('message_id'),
    text: text('text'),
    html: text('html'),
    /** [{filename, contentType, size}] */
    attachments: jsonb('attachments').notNull().default([]),
    size: integer('size').notNull(),
  },
  (t) => [index('mail_messages_received_idx').on(t.receivedAt)],
);

/**
 * Membrane alerts as the nightly run last saw them, per site, stage and kind: a row is open (cleared_at
 * null) from the run that first saw the threshold crossed until a run sees the stage's latest point
 * without it. The alert mail goes out when the row is opened, not every night after.
 */
export const membraneAlerts = pgTable(
  'membrane_alerts',
  {
    id: serial('id').primaryKey(),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    stage: text('stage').notNull(),
    kind: text('kind').notNull(),
    /** When the crossing began, as the performance answer dates it (`since`). */
    crossedAt: instant('crossed_at').notNull(),
    detectedAt: instant('detected_at').notNull().defaultNow(),
    lastSeenAt: instant('last_seen_at').notNull().defaultNow(),
    clearedAt: instant('cleared_at'),
    changePct: doublePrecision('change_pct').notNull(),
    thresholdPct: doublePrecision('threshold_pct').notNull(),
    nightlyRunId: integer('nightly_run_id').references(() => nightlyRuns.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('membrane_alerts_open_key').on(t.siteId, t.stage, t.kind).where(sql`cleared_at is null`),
    index('membrane_alerts_detected_idx').on(t.siteId, t.detectedAt),
    check('membrane_alerts_kind_check', oneOf('kind', membraneAlertKinds)),
  ],
);
