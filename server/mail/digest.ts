// The nightly digest of one recipient: the period's figures of each site, what changed since their last
// digest, a link to the app, their workbook. A recipient reads what their role may read in the app:
// the sections follow the roles of the KPI catalog and of the import routes, so the mail never shows a
// finance reader the reliability figures the Reliability page would refuse them (docs/design.md §2).
import type { MembraneAlertKind, Role } from '#shared/schemas/enums.ts';
import type { FinishedImport, RecordedFailure } from '../db/queries/digest-changes.ts';
import type { MailAttachment } from '../db/queries/outbox.ts';
import { downtimeKpi, performanceKpi, reliabilityKpi } from '../services/kpi-catalog.ts';
import { changeText, countText, hoursText, instantText, kindNames, moneyText, percentText, roleNames, volumeText } from './format.ts';
import type { SiteReport } from './figures.ts';
import { renderHtml, renderText, type Block, type MailDocument } from './render.ts';

/** Who may see the import history (GET /api/imports and the Imports page: server/routes/imports.ts). */
export const importReaders: readonly Role[] = ['admin', 'engineer'];

export interface Recipient {
  email: string;
  name: string;
  role: Role;
  /** Null for an address of the digestRecipients setting that is no user's. */
  userId: number | null;
}

export interface SiteChanges {
  imports: FinishedImport[];
  failures: RecordedFailure[];
  alerts: { stage: string; kind: MembraneAlertKind; changePct: number; detectedAt: Date }[];
}

export interface DigestInput {
  recipient: Recipient;
  reportDate: string;
  sites: { report: SiteReport; changes: SiteChanges }[];
  /** Start of "what changed": the recipient's last digest, or a day before this run. */
  since: Date;
  firstDigest: boolean;
  publicUrl: string;
  attachments: readonly MailAttachment[];
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

export const alertKindLabels: Record<MembraneAlertKind, string> = {
  'permeate-flow-drop': 'normalized permeate flow',
  'differential-pressure-rise': 'normalized differential pressure',
  'salt-passage-rise': 'normalized salt passage',
};

const listed = 15;
const more = (n: number, what: string) => (n > listed ? [`… and ${n - listed} more ${what}.`] : []);

/** "Tamsel Flats (TFD)", or the code alone when the site is named by it. */
export const siteTitle = (site: { code: string; name: string }) => (site.name && site.name !== site.code ? `${site.name} (${site.code})` : site.code);

/** A link into the app at `path` (with a query), below PUBLIC_URL. */
export function appLink(publicUrl: string, path: string, query: Record<string, string> = {}): string {
  const url = new URL(path.replace(/^\//, ''), publicUrl.endsWith('/') ? publicUrl : `${publicUrl}/`);
  for (const [k, v] of Object.entries(query)) url.searchParams.set(k, v);
  return url.toString();
}

function siteBlocks(input: DigestInput, { report, changes }: DigestInput['sites'][number]): Block[] {
  const role = input.recipient.role;
  const { site, figures } = report;
  const zone = site.timeZone;
  const blocks: Block[] = [{ type: 'heading', text: siteTitle(site) }];
  const [day, week] = figures.windows;
  blocks.push({
    type: 'paragraph',
    muted: true,
    text: `Yesterday: ${instantText(day.from, zone)} to ${instantText(day.to, zone)}. Last 7 days: from ${instantText(week.from, zone)}.`,
  });
  const columns = ['Yesterday', 'Last 7 days'];
  if (reliabilityKpi.access.includes(role)) {
    const r = (w: typeof day) => w.reliability;
    blocks.push({
      type: 'figures',
      columns,
      rows: [
        { label: 'Availability (inherent, MTBF / (MTBF + MTTR))', values: figures.windows.map((w) => (r(w) ? percentText(r(w)!.availability) : '—')) },
        { label: 'Operational availability', values: figures.windows.map((w) => (r(w) ? percentText(r(w)!.operationalAvailability) : '—')) },
        { label: 'MTBF', values: figures.windows.map((w) => (r(w) ? hoursText(r(w)!.mtbfHours) : '—')) },
        { label: 'MTTR', values: figures.windows.map((w) => (r(w) ? hoursText(r(w)!.mttrHours) : '—')) },
        { label: 'Failures', values: figures.windows.map((w) => (r(w) ? countText(r(w)!.failures) : '—')) },
      ],
    });
  }
  if (downtimeKpi.access.includes(role)) {
    const d = (w: typeof day) => w.downtime;
    blocks.push({
      type: 'figures',
      columns,
      rows: [
        { label: 'Downtime', values: figures.windows.map((w) => (d(w) ? hoursText(d(w)!.hours) : '—')) },
        { label: 'of it unplanned', values: figures.windows.map((w) => (d(w) ? hoursText(d(w)!.unplannedHours) : '—')) },
        { label: 'Stops', values: figures.windows.map((w) => (d(w) ? countText(d(w)!.events) : '—')) },
        { label: 'Lost permeate (stop hours × rated flow)', values: figures.windows.map((w) => (d(w) ? volumeText(d(w)!.lostVolumeM3) : '—')) },
        { label: 'Downtime cost (lost permeate × water value)', values: figures.windows.map((w) => (d(w) ? moneyText(d(w)!.cost, d(w)!.currency) : '—')) },
      ],
    });
  }
  const notes = [...new Set(figures.windows.flatMap((w) => w.notes))].filter((n) => reliabilityKpi.access.includes(role) || !/^(Reliability|Membrane performance):/.test(n));
  if (notes.length) blocks.push({ type: 'list', items: notes });
  if (performanceKpi.access.includes(role)) {
    if (report.alerts.length === 0) {
      blocks.push({ type: 'paragraph', text: 'Membrane performance: no stage is past an alert threshold on its latest day.' });
    } else {
      blocks.push({ type: 'paragraph', text: 'Membrane alerts on the latest day of each stage:' });
      blocks.push({
        type: 'list',
        items: report.alerts.map((a) => `${a.stage}: ${a.message.replace(/\.$/, '')} (threshold ${a.thresholdPct} %, past it since ${instantText(a.since, zone)}). ${a.recommendation}`),
      });
      blocks.push({ type: 'cautions', title: 'Before any cleaning or vessel work', items: report.alerts[0].cautions });
    }
  }

  blocks.push({ type: 'paragraph', text: input.firstDigest ? 'What changed in the last 24 hours:' : `What changed since your last digest (${instantText(input.since, zone)}):` });
  const changed: string[] = [];
  const landed = changes.imports.filter((i) => i.status !== 'failed');
  const failed = changes.imports.filter((i) => i.status === 'failed');
  if (importReaders.includes(role)) {
    changed.push(
      ...changes.imports.slice(0, listed).map((i) =>
        i.status === 'failed'
          ? `Import failed: ${i.file} (${kindNames[i.kind]}), ${instantText(i.finishedAt, zone)}.`
          : `Imported ${i.file} (${kindNames[i.kind]}): ${countText(i.rowsInserted)} rows added${i.rowsRejected ? `, ${countText(i.rowsRejected)} rejected` : ''}.`,
      ),
      ...more(changes.imports.length, 'imports'),
    );
  } else if (changes.imports.length > 0) {
    changed.push(`${countText(landed.length)} file${landed.length === 1 ? '' : 's'} imported${failed.length ? `, ${countText(failed.length)} failed (the engineers were told)` : ''}.`);
  }
  if (reliabilityKpi.access.includes(role)) {
    changed.push(
      ...changes.failures.slice(0, listed).map((f) => `Failure recorded: ${f.woNumber} on ${f.asset}, ${f.failureCode}, reported ${instantText(f.reportedAt, zone)}.`),
      ...more(changes.failures.length, 'failures'),
    );
  }
  if (performanceKpi.access.includes(role)) {
    changed.push(...changes.alerts.map((a) => `New membrane alert: ${a.stage}, ${alertKindLabels[a.kind]} ${changeText(a.changePct)}.`));
  }
  blocks.push({ type: 'list', items: changed.length ? changed : ['Nothing new.'] });
  return blocks;
}

/** The digest of one recipient, as subject, plain text and HTML. */
export function buildDigest(input: DigestInput): RenderedMail {
  const { recipient } = input;
  const names = input.sites.map((s) => s.report.site.code).join(', ');
  const alertCount = performanceKpi.access.includes(recipient.role) ? input.sites.reduce((n, s) => n + s.report.alerts.length, 0) : 0;
  const subject = `Osmia nightly digest ${input.reportDate}${names ? ` · ${names}` : ''}${alertCount ? ` · ${alertCount} membrane alert${alertCount === 1 ? '' : 's'}` : ''}`;
  const blocks: Block[] = [];
  if (input.sites.length === 0) blocks.push({ type: 'paragraph', text: 'No site has data yet: import an asset register first.' });
  for (const s of input.sites) blocks.push(...siteBlocks(input, s));
  blocks.push({ type: 'link', text: 'Open Osmia', href: appLink(input.publicUrl, '/') });
  if (input.attachments.length) blocks.push({ type: 'paragraph', text: `Attached: ${input.attachments.map((a) => a.filename).join(', ')}.` });
  const doc: MailDocument = {
    title: `Nightly digest for ${input.reportDate}`,
    blocks,
    footer: [
      `You receive this as ${recipient.name || recipient.email} (${roleNames[recipient.role]}). ${
        recipient.userId === null ? 'An administrator listed this address under Settings, Nightly digest.' : 'Change it on the Settings page under "Your nightly e-mail".'
      }`,
      'Osmia reports; the plant’s own procedures and the element maker’s instructions decide the work.',
    ],
  };
  return { subject, text: renderText(doc), html: renderHtml(doc) };
}
