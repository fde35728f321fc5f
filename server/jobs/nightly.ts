// The nightly run (`osmia nightly`, cron or `osmia schedule`): import every file waiting in the inbox,
// refresh the derived tables once, then mail — each a named step of `nightlySteps`, recorded in
// nightly_runs as it goes. One run at a time per database, also across machines: the run holds
// pg_try_advisory_lock(4, 1) on a connection of its own for as long as it lasts (docs/design.md §7).
import { stat } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import type { ImportKind, NightlyRunOutcome, NightlyTrigger, Role } from '#shared/schemas/enums.ts';
import type { ImportRecord } from '#shared/schemas/imports.ts';
import type { NightlyFile, NightlyRun, NightlyStep, NightlyStepName } from '#shared/schemas/nightly.ts';
import type { Db } from '../db/client.ts';
import { alertsDetectedSince } from '../db/queries/membrane-alerts.ts';
import { failuresRecordedSince, importsFinishedSince } from '../db/queries/digest-changes.ts';
import { isDatabaseUnavailable } from '../db/errors.ts';
import { findLandedImport, hasLandedFingerprint, streamRejects } from '../db/queries/imports.ts';
import {
  advisoryLockHolder,
  closeInterruptedRuns,
  finishNightlyRun,
  getNightlyRun,
  insertNightlyRun,
  saveNightlyProgress,
} from '../db/queries/nightly-runs.ts';
import { lastDigestAt, queueMail, type MailAttachment } from '../db/queries/outbox.ts';
import { listSites, type SiteRow } from '../db/queries/sites.ts';
import { listSubscribedUsers, listUsers } from '../db/queries/users.ts';
import type { ColumnMap } from '../importers/column-map.ts';
import { detectKind } from '../importers/detect.ts';
import { fileFingerprint, sha256File } from '../importers/run.ts';
import { queueImportFailureMail, recordMembraneAlerts } from '../mail/alerts.ts';
import { buildDigest, type Recipient } from '../mail/digest.ts';
import { dayInZone, digestWindows, siteReport, type SiteReport } from '../mail/figures.ts';
import { instantText } from '../mail/format.ts';
import { flushOutbox } from '../mail/outbox.ts';
import type { Mailer } from '../mail/transport.ts';
import { reportFileName, workbooks, writeReport } from '../reports/index.ts';
import { defaultReportsDir } from '../reports/stored.ts';
import { importFile } from '../services/imports.ts';
import { resolveSite } from '../services/scope.ts';
import { getSettings } from '../services/settings.ts';
import { listInbox, moveFromInbox } from './inbox.ts';
import { refresh } from './refresh.ts';

/** The advisory lock of the nightly run: (class 4, object 1). Imports use class 2 (per import) and 3 (per site). */
export const nightlyLock = { classId: 4, objId: 1 } as const;

/** The order files are imported in: what a file refers to is imported before it (docs/design.md §5). */
export const importOrder: readonly ImportKind[] = ['assets', 'tags', 'elements', 'work-orders', 'job-steps', 'historian'];

export interface NightlyOptions {
  inbox: string;
  trigger: NightlyTrigger;
  /** For every import of the run (as `osmia import --site`): optional while one site exists; an asset register with it creates the site. */
  site?: string;
  /** Zone of naive timestamps, and of a site an asset register creates (as `osmia import --tz`). */
  tz?: string;
  columnMap?: ColumnMap;
  /** The day the digest reports up to (its windows end at its midnight); default today in `timeZone`. */
  reportDate?: string;
  /** Zone of "today" and of the done/<date>/ folders: NIGHTLY_TZ, else the first site's, else UTC. */
  timeZone?: string;
  /** Where the day's workbooks go (reports/<date>/ below it): REPORTS_DIR, else reports/ at the project root. */
  reportsDir?: string;
  publicUrl: string;
  /** Null when no SMTP server is configured: mail is queued and waits in the outbox. */
  mailer: Mailer | null;
  noMailerReason?: string;
  log?: (line: string) => void;
  /** The clock (tests of the dates use their own). */
  now?: () => Date;
}

/** A workbook for the digest of the roles in `audience` (written by the workbooks step). */
export interface NightlyWorkbook {
  audience: readonly Role[];
  attachment: MailAttachment;
}

/** What the steps of one run share. */
export interface NightlyContext {
  db: Db;
  options: NightlyOptions;
  runId: number;
  reportDate: string;
  /** The <date> of done/<date>/ and failed/<date>/. */
  folderDate: string;
  zone: string;
  files: NightlyFile[];
  /** Workbooks to attach to each recipient's digest, by role. */
  workbooks: NightlyWorkbook[];
  figures: NightlyRun['figures'];
  mail: NightlyRun['mail'];
  log: (line: string) => void;
  /** Write the run's progress to its nightly_runs row. */
  save: () => Promise<void>;
}

/** One step of the run: its work, and one line on what it did. A step that throws is recorded failed; the next steps still run. */
export interface NightlyStepDefinition {
  name: NightlyStepName;
  run: (ctx: NightlyContext) => Promise<string>;
}

const reasonOf = (record: ImportRecord) => record.error ?? (record.rowsRejected ? `${record.rowsRejected} rows rejected` : null);

async function rejectsText(db: Db, record: ImportRecord): Promise<string> {
  const lines = [
    record.status === 'partial'
      ? `${record.rowsRejected} of ${record.rowsRead} rows were rejected; the other rows were imported (import ${record.id}).`
      : `Not imported: ${record.error ?? 'the file was refused'}`,
  ];
  if (record.id !== null && record.rowsRejected > 0) {
    lines.push('', 'line\treason');
    for await (const page of streamRejects(db.$client, record.id)) for (const r of page) lines.push(`${r.line}\t${r.reason}`);
  }
  return lines.join('\n');
}

/** Has this file's content landed before for its kind and site? (The fingerprint first, so a new file is not hashed twice.) */
async function landedBefore(db: Db, path: string, kind: ImportKind, site: string | undefined): Promise<number | undefined> {
  let siteRow: SiteRow;
  try {
    siteRow = await resolveSite(db, site);
  } catch {
    return undefined; // no such site yet: the import itself says what is wrong, or creates it
  }
  const fingerprint = await fileFingerprint(path, (await stat(path)).size);
  if (!(await hasLandedFingerprint(db.$client, siteRow.id, kind, fingerprint))) return undefined;
  return findLandedImport(db.$client, siteRow.id, kind, await sha256File(path));
}

/** Every waiting file through `importFile`, in dependency order, refresh deferred; each moved when done. */
export const importsStep: NightlyStepDefinition = {
  name: 'imports',
  run: async (ctx) => {
    const { db, options } = ctx;
    const names = await listInbox(options.inbox);
    const planned = await Promise.all(names.map(async (name) => ({ name, detected: await detectKind(join(options.inbox, name), options.columnMap) })));
    const rank = (p: (typeof planned)[number]) => (p.detected.kind === null ? -1 : importOrder.indexOf(p.detected.kind));
    planned.sort((a, b) => rank(a) - rank(b) || a.name.localeCompare(b.name, 'en', { numeric: true }));
    for (const { name, detected } of planned) {
      const path = join(options.inbox, name);
      const file: NightlyFile = { file: name, kind: detected.kind, outcome: 'failed', importId: null, rowsRead: 0, rowsRejected: 0, movedTo: null, reason: null };
      if (detected.kind === null) {
        file.reason = detected.reason;
        file.movedTo = await moveFromInbox(options.inbox, name, 'failed', ctx.folderDate, `Not imported: ${detected.reason}`);
      } else {
        const landed = await landedBefore(db, path, detected.kind, options.site);
        if (landed !== undefined) {
          // Imported by an earlier run that stopped before it moved the file (or the same content again).
          Object.assign(file, { outcome: 'already-imported', importId: landed, reason: `The same content was imported before (import ${landed}); not imported again.` });
          file.movedTo = await moveFromInbox(options.inbox, name, 'done', ctx.folderDate);
        } else {
          let record: ImportRecord | null = null;
          try {
            record = await importFile(db, { kind: detected.kind, path, fileName: name, site: options.site, tz: options.tz, columnMap: options.columnMap, actor: 'nightly', refresh: false });
          } catch (err) {
            if (isDatabaseUnavailable(err)) {
              Object.assign(file, { outcome: 'left-in-inbox', reason: `The database could not be reached (${(err as Error).message}); the next run tries again.` });
              ctx.files.push(file);
              await ctx.save().catch(() => undefined);
              throw err;
            }
            // The importer recorded the failure (its id rides on the error) and kept nothing of the file.
            Object.assign(file, { importId: (err as { importId?: number }).importId ?? null, reason: `Import failed, nothing was kept: ${(err as Error).message}` });
            file.movedTo = await moveFromInbox(options.inbox, name, 'failed', ctx.folderDate, `Not imported: ${file.reason}`);
          }
          if (record) {
            Object.assign(file, { importId: record.id, rowsRead: record.rowsRead, rowsRejected: record.rowsRejected, reason: reasonOf(record) });
            if (record.status === 'completed' || record.status === 'partial' || record.status === 'duplicate') {
              file.outcome = record.status;
              file.movedTo = await moveFromInbox(options.inbox, name, 'done', ctx.folderDate, record.status === 'partial' ? await rejectsText(db, record) : undefined);
            } else {
              file.movedTo = await moveFromInbox(options.inbox, name, 'failed', ctx.folderDate, await rejectsText(db, record));
            }
          }
        }
      }
      ctx.files.push(file);
      ctx.log(`${name}: ${file.outcome}${file.kind ? ` (${file.kind})` : ''}${file.movedTo ? ` → ${file.movedTo}` : ''}${file.outcome === 'failed' && file.reason ? `: ${file.reason}` : ''}`);
      await ctx.save();
    }
    const by = (o: NightlyFile['outcome']) => ctx.files.filter((f) => f.outcome === o).length;
    return ctx.files.length === 0
      ? 'the inbox was empty'
      : `${ctx.files.length} file${ctx.files.length === 1 ? '' : 's'}: ${(['completed', 'partial', 'duplicate', 'already-imported', 'failed'] as const)
          .filter((o) => by(o) > 0)
          .map((o) => `${by(o)} ${o}`)
          .join(', ')}`;
  },
};

/** One refresh of the derived tables for everything the imports brought (they ran with refresh deferred). */
export const refreshStep: NightlyStepDefinition = {
  name: 'refresh',
  run: async (ctx) => {
    const r = await refresh(ctx.db);
    return `${r.tags} tags, ${r.hoursRebuilt} hourly rollups, ${r.stopsRebuilt} stops rebuilt in ${(r.durationMs / 1000).toFixed(1)} s`;
  },
};

/**
 * Who receives mail: the enabled users who subscribed, each with their role; then the addresses of the
 * digestRecipients setting that are no user's, which get what a manager reads.
 */
export async function mailRecipients(db: Db, extraAddresses: readonly string[]): Promise<Recipient[]> {
  const subscribed = await listSubscribedUsers(db);
  const userEmails = new Set((await listUsers(db)).map((u) => u.email.toLowerCase()));
  const extra = [...new Set(extraAddresses.map((a) => a.toLowerCase()))].filter((a) => !userEmails.has(a));
  return [...subscribed.map((u) => ({ email: u.email, name: u.name, role: u.role, userId: u.id })), ...extra.map((email) => ({ email, name: '', role: 'manager' as const, userId: null }))];
}

/** Alert mails, then each recipient's digest, all into the outbox; then whatever the outbox holds is sent. */
export const mailStep: NightlyStepDefinition = {
  name: 'mail',
  run: async (ctx) => {
    const { db, options } = ctx;
    const settings = await getSettings(db);
    const reports: SiteReport[] = [];
    for (const site of await listSites(db.$client)) reports.push(await siteReport(db, site, ctx.reportDate, settings));
    ctx.figures = reports.map((r) => r.figures);
    await ctx.save();
    const recipients = await mailRecipients(db, settings.digestRecipients);
    let queued = 0;
    for (const report of reports) queued += (await recordMembraneAlerts(db, report, ctx.runId, recipients, options.publicUrl)).queued;
    queued += await queueImportFailureMail(db, ctx.runId, ctx.files.filter((f) => f.outcome === 'failed'), recipients, options.inbox, options.publicUrl);
    const dayAgo = new Date((options.now?.() ?? new Date()).getTime() - 24 * 3_600_000);
    for (const recipient of recipients) {
      const dedupeKey = `digest:${ctx.reportDate}:${recipient.email.toLowerCase()}`;
      const last = await lastDigestAt(db.$client, recipient.email, dedupeKey);
      const since = last ?? dayAgo;
      const sites = [];
      for (const report of reports) {
        sites.push({
          report,
          changes: {
            imports: await importsFinishedSince(db.$client, report.site.id, since),
            failures: await failuresRecordedSince(db.$client, report.site.id, since),
            alerts: await alertsDetectedSince(db.$client, report.site.id, since),
          },
        });
      }
      const attachments = ctx.workbooks.filter((w) => w.audience.includes(recipient.role)).map((w) => w.attachment);
      const mail = buildDigest({ recipient, reportDate: ctx.reportDate, sites, since, firstDigest: last === null, publicUrl: options.publicUrl, attachments });
      if (await queueMail(db.$client, { kind: 'digest', dedupeKey, to: recipient.email, ...mail, attachments, nightlyRunId: ctx.runId })) queued++;
    }
    const flushed = await flushOutbox(db, options.mailer, options.noMailerReason);
    ctx.mail = { queued, sent: flushed.sent, waiting: flushed.waiting, relay: options.mailer?.relay ?? null, error: flushed.error };
    await ctx.save();
    const summary = `${recipients.length} recipient${recipients.length === 1 ? '' : 's'}; ${queued} queued, ${flushed.sent} sent`;
    if (flushed.waiting > 0) throw new Error(`${summary}; ${flushed.waiting} wait in the outbox for the next run: ${flushed.error}`);
    return summary;
  },
};

/**
 * Every workbook of every site for the last 7 days of the digest (reports/<date>/<name>-<site>-<from>-<to>.xlsx,
 * listed on the Reports page), each added to `ctx.workbooks` for the digest of the roles that may have it.
 * A workbook that cannot be written fails alone: the others are still written and mailed, and the step says which.
 */
export const workbooksStep: NightlyStepDefinition = {
  name: 'workbooks',
  run: async (ctx) => {
    const settings = await getSettings(ctx.db);
    const window = digestWindows(ctx.reportDate).find((w) => w.label === 'last-7-days')!;
    const folder = join(ctx.options.reportsDir ?? defaultReportsDir, ctx.reportDate);
    const failed: string[] = [];
    for (const site of await listSites(ctx.db.$client)) {
      for (const workbook of workbooks) {
        const fileName = reportFileName(workbook.name, site.code, { fromDay: window.from, toDay: window.to });
        try {
          const written = await writeReport(ctx.db, { name: workbook.name, site: site.code, from: window.from, to: window.to }, join(folder, fileName), settings);
          ctx.workbooks.push({ audience: workbook.access, attachment: { filename: fileName, path: written.path } });
        } catch (err) {
          failed.push(`${fileName}: ${err instanceof Error ? err.message : String(err)}`);
        }
      }
    }
    const summary = `${ctx.workbooks.length} workbook${ctx.workbooks.length === 1 ? '' : 's'} in ${folder}`;
    if (failed.length > 0) throw new Error(`${summary}; not written: ${failed.join('; ')}`);
    return summary;
  },
};

/** The steps of a run, in order: a step that fails is recorded, and the next ones still run. */
export const nightlySteps: readonly NightlyStepDefinition[] = [importsStep, refreshStep, workbooksStep, mailStep];

/** How a run ended, from its files and steps: failed when the data could not be brought up to date, partial when something else did not go. */
export function runOutcome(files: readonly NightlyFile[], steps: readonly NightlyStep[]): NightlyRunOutcome {
  if (steps.some((s) => s.status === 'failed' && (s.name === 'imports' || s.name === 'refresh'))) return 'failed';
  if (steps.some((s) => s.status === 'failed') || files.some((f) => f.outcome === 'failed' || f.outcome === 'partial' || f.outcome === 'left-in-inbox')) return 'partial';
  return 'ok';
}

/** The zone of the run's "today" and of the schedule: the one configured (NIGHTLY_TZ), else the first site's, else UTC. */
export async function nightlyZone(db: Db, configured: string | undefined): Promise<string> {
  if (configured) return configured;
  const [first] = [...(await listSites(db.$client))].sort((a, b) => a.id - b.id);
  return first?.timeZone ?? 'UTC';
}

/**
 * Run the nightly job once. Another run holding the lock makes this one a recorded `skipped` run that
 * does nothing else. Runs left unfinished by a killed process are closed first; their files are still in
 * the inbox (or already moved), and the landed imports among them are recognised by content.
 */
export async function runNightly(db: Db, options: NightlyOptions): Promise<NightlyRun> {
  const log = options.log ?? (() => {});
  const now = options.now ?? (() => new Date());
  const zone = await nightlyZone(db, options.timeZone);
  const reportDate = options.reportDate ?? dayInZone(now(), zone);
  const base = { trigger: options.trigger, host: hostname(), pid: process.pid, inbox: options.inbox, reportDate };

  // A fresh connection for the lock: its start is the run's start, which a second run reports.
  const lock = new pg.Client({ connectionString: db.$client.options.connectionString, application_name: `osmia nightly on ${base.host} (pid ${base.pid})`, options: '-c TimeZone=UTC' });
  let lockLost = false;
  lock.on('error', () => (lockLost = true));
  await lock.connect();
  try {
    const { rows } = await lock.query<{ locked: boolean }>('select pg_try_advisory_lock($1, $2) as locked', [nightlyLock.classId, nightlyLock.objId]);
    if (!rows[0].locked) {
      const holder = await advisoryLockHolder(db.$client, nightlyLock.classId, nightlyLock.objId);
      const error = `another nightly run is in progress since ${holder ? `${instantText(holder.since, zone)} (${holder.application})` : 'a moment ago'}: this run did nothing`;
      log(error);
      const id = await insertNightlyRun(db.$client, { ...base, outcome: 'skipped', error });
      return (await getNightlyRun(db.$client, id))!;
    }
    const interrupted = await closeInterruptedRuns(db.$client);
    if (interrupted) log(`${interrupted} earlier run${interrupted === 1 ? ' was' : 's were'} interrupted; this run takes over the inbox`);
    const runId = await insertNightlyRun(db.$client, base);
    const steps: NightlyStep[] = [];
    const ctx: NightlyContext = {
      db,
      options,
      runId,
      reportDate,
      folderDate: dayInZone(now(), zone),
      zone,
      files: [],
      workbooks: [],
      figures: [],
      mail: null,
      log,
      save: () => saveNightlyProgress(db.$client, runId, { files: ctx.files, steps, figures: ctx.figures, mail: ctx.mail }),
    };
    log(`nightly run ${runId}: inbox ${options.inbox}, digest up to ${reportDate}`);
    for (const step of nightlySteps) {
      const startedAt = new Date();
      let detail: string | null = null;
      let error: string | null = null;
      try {
        detail = await step.run(ctx);
      } catch (err) {
        error = (err as Error).message;
      }
      steps.push({ name: step.name, status: error === null ? 'ok' : 'failed', startedAt: startedAt.toISOString(), durationMs: Date.now() - startedAt.getTime(), detail, error });
      log(`${step.name}: ${error === null ? detail : `failed: ${error}`}`);
      await ctx.save().catch((err: Error) => log(`could not record the progress: ${err.message}`));
    }
    const outcome = runOutcome(ctx.files, steps);
    const failedSteps = steps.filter((s) => s.status === 'failed');
    const error = [...failedSteps.map((s) => `${s.name}: ${s.error}`), ...(lockLost ? ['the connection holding the nightly lock was lost during the run'] : [])].join('; ') || null;
    await finishNightlyRun(db.$client, runId, outcome, error);
    return (await getNightlyRun(db.$client, runId))!;
  } finally {
    await lock.query('select pg_advisory_unlock($1, $2)', [nightlyLock.classId, nightlyLock.objId]).catch(() => undefined);
    await lock.end().catch(() => undefined);
  }
}
