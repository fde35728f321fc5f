// Alert mails: a membrane threshold first crossed (not every night after: the state is kept in
// membrane_alerts), and a nightly import that failed.
import type { MembraneAlertKind } from '#shared/schemas/enums.ts';
import type { NightlyFile } from '#shared/schemas/nightly.ts';
import type { PerformanceReport } from '#shared/schemas/performance.ts';
import type { Db } from '../db/client.ts';
import { clearAlerts, listOpenAlerts, openAlert, touchAlerts } from '../db/queries/membrane-alerts.ts';
import { queueMail } from '../db/queries/outbox.ts';
import { performanceKpi } from '../services/kpi-catalog.ts';
import { alertKindLabels, appLink, importReaders, siteTitle, type Recipient, type RenderedMail } from './digest.ts';
import type { SiteAlert, SiteReport } from './figures.ts';
import { changeText, instantText, kindNames, roleNames } from './format.ts';
import { renderHtml, renderText, type MailDocument } from './render.ts';

// The stored kinds (membrane_alerts.kind) are the performance answer's kinds: a type error when either list changes alone.
type AnswerAlertKind = PerformanceReport['stages'][number]['alerts'][number]['kind'];
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const _storedKindsAreTheAnswers: Same<AnswerAlertKind, MembraneAlertKind> = true;

const footer = (r: Recipient) => [
  `You receive this as ${r.name || r.email} (${roleNames[r.role]}) because you get the nightly digest. ${
    r.userId === null ? 'An administrator listed this address under Settings, Nightly digest.' : 'Change it on the Settings page under "Your nightly e-mail".'
  }`,
];

/** The mail for a membrane alert first seen: what crossed, the recommendation, and the cautions of any cleaning. */
export function membraneAlertMail(recipient: Recipient, report: SiteReport, alert: SiteAlert, publicUrl: string): RenderedMail {
  const zone = report.site.timeZone;
  const doc: MailDocument = {
    title: `Membrane alert: ${alert.stage}, ${alertKindLabels[alert.kind]} ${changeText(alert.changePct)}`,
    blocks: [
      { type: 'paragraph', text: `${siteTitle(report.site)}, stage ${alert.stage}: ${alert.message}` },
      { type: 'paragraph', text: `The alert threshold is ${alert.thresholdPct} % (a plant setting). The stage has been past it since ${instantText(alert.since, zone)}.` },
      { type: 'paragraph', text: alert.recommendation },
      { type: 'cautions', title: 'Before a clean-in-place or any work on the vessels', items: alert.cautions },
      { type: 'link', text: 'Membrane performance in Osmia', href: appLink(publicUrl, '/performance', { site: report.site.code }) },
    ],
    footer: [...footer(recipient), 'This mail is sent once, when the threshold is first crossed; the nightly digest lists the alert while it lasts.'],
  };
  return { subject: `Osmia membrane alert · ${report.site.code} ${alert.stage} · ${alertKindLabels[alert.kind]} ${changeText(alert.changePct)}`, text: renderText(doc), html: renderHtml(doc) };
}

/**
 * Compare the site's alerts with those open from earlier runs: open the new ones and queue their mail in
 * the same transaction (so a crash never opens an alert without its mail, or mails it twice), keep the
 * ones still there, and clear the ones whose stage's latest point no longer crosses. Answers the alerts
 * opened now.
 */
export async function recordMembraneAlerts(db: Db, report: SiteReport, runId: number, recipients: readonly Recipient[], publicUrl: string): Promise<{ opened: SiteAlert[]; queued: number }> {
  if (!report.performanceAnswered) return { opened: [], queued: 0 };
  const open = await listOpenAlerts(db.$client, report.site.id);
  const key = (a: { stage: string; kind: string }) => `${a.stage}\u0000${a.kind}`;
  const current = new Map(report.alerts.map((a) => [key(a), a]));
  const openKeys = new Set(open.map(key));
  await touchAlerts(db.$client, open.filter((o) => current.has(key(o))).map((o) => o.id));
  await clearAlerts(db.$client, open.filter((o) => !current.has(key(o)) && report.stagesWithLatest.has(o.stage)).map((o) => o.id));
  const readers = recipients.filter((r) => performanceKpi.access.includes(r.role));
  const opened: SiteAlert[] = [];
  let queued = 0;
  for (const alert of report.alerts) {
    if (openKeys.has(key(alert))) continue;
    const client = await db.$client.connect();
    try {
      await client.query('begin');
      const id = await openAlert(client, {
        siteId: report.site.id,
        stage: alert.stage,
        kind: alert.kind,
        crossedAt: new Date(alert.since),
        changePct: alert.changePct,
        thresholdPct: alert.thresholdPct,
        nightlyRunId: runId,
      });
      if (id !== null) {
        opened.push(alert);
        for (const r of readers) {
          const mail = membraneAlertMail(r, report, alert, publicUrl);
          if (await queueMail(client, { kind: 'membrane-alert', dedupeKey: `membrane-alert:${id}:${r.email.toLowerCase()}`, to: r.email, ...mail, attachments: [], nightlyRunId: runId })) queued++;
        }
      }
      await client.query('commit');
    } catch (err) {
      await client.query('rollback').catch(() => undefined);
      throw err;
    } finally {
      client.release();
    }
  }
  return { opened, queued };
}

/** The mail for the files a nightly run could not import: each with why, and where it now lies. */
export function importFailureMail(recipient: Recipient, files: readonly NightlyFile[], inbox: string, publicUrl: string): RenderedMail {
  const doc: MailDocument = {
    title: `Nightly import: ${files.length} file${files.length === 1 ? '' : 's'} not imported`,
    blocks: [
      {
        type: 'paragraph',
        text: 'The nightly run could not import these files. Nothing of a refused file was kept; the other files of the run went in as usual.',
      },
      {
        type: 'list',
        items: files.map((f) => `${f.file} (${f.kind ? kindNames[f.kind] : 'kind not recognised'}): ${f.reason ?? 'no reason given'}${f.movedTo ? ` Moved to ${f.movedTo}.` : ''}`),
      },
      {
        type: 'paragraph',
        text: `Inbox: ${inbox}. The reason is also in <file>.reason.txt beside each file. Put a corrected file back into the inbox for the next run, or import it by hand with bin/osmia import <kind> FILE.`,
      },
      { type: 'link', text: 'Nightly runs in Osmia', href: appLink(publicUrl, '/nightly') },
    ],
    footer: footer(recipient),
  };
  return { subject: `Osmia nightly import failed · ${files.map((f) => f.file).join(', ').slice(0, 120)}`, text: renderText(doc), html: renderHtml(doc) };
}

/** Queue the import-failure mail for the subscribed recipients who may see imports. */
export async function queueImportFailureMail(db: Db, runId: number, files: readonly NightlyFile[], recipients: readonly Recipient[], inbox: string, publicUrl: string): Promise<number> {
  if (files.length === 0) return 0;
  let queued = 0;
  for (const r of recipients.filter((x) => importReaders.includes(x.role))) {
    const mail = importFailureMail(r, files, inbox, publicUrl);
    if (await queueMail(db.$client, { kind: 'import-failure', dedupeKey: `import-failure:${runId}:${r.email.toLowerCase()}`, to: r.email, ...mail, attachments: [], nightlyRunId: runId })) queued++;
  }
  return queued;
}
