// Both parts of a mail from one document (multipart/alternative, RFC 2046 §5.1.4), text from imported files
// escaped in the HTML part, and the digest's sections following the reader's role (docs/design.md §2).
import { describe, expect, it } from 'vitest';
import type { NightlyFigures } from '#shared/schemas/nightly.ts';
import { cleaningCautions } from '#shared/cautions.ts';
import { appLink, buildDigest, type DigestInput, type Recipient } from '#server/mail/digest.ts';
import type { SiteReport } from '#server/mail/figures.ts';
import { escapeHtml, renderHtml, renderText } from '#server/mail/render.ts';

describe('escapeHtml', () => {
  // The HTML standard's serialization escapes & < > in text and " in attribute values; ' is escaped too so a
  // single-quoted attribute is safe as well (common practice, OWASP's output-encoding rule for HTML).
  it.each([
    ['<script>alert(1)</script>', '&lt;script&gt;alert(1)&lt;/script&gt;'],
    ['A & B', 'A &amp; B'],
    ['"quoted" and \'single\'', '&quot;quoted&quot; and &#39;single&#39;'],
    ['&amp; stays text', '&amp;amp; stays text'],
  ])('%s → %s', (input, output) => expect(escapeHtml(input)).toBe(output));
});

describe('renderHtml and renderText', () => {
  const doc = {
    title: 'Title <b>bold</b>',
    blocks: [
      { type: 'paragraph' as const, text: 'Pump P-1 <img src=x onerror=alert(1)> stopped' },
      { type: 'figures' as const, columns: ['Day', 'Week'], rows: [{ label: 'MTBF <x>', values: ['10.0 h', '70.0 h'] }] },
      { type: 'link' as const, text: 'Open', href: 'javascript:alert(1)' },
      { type: 'link' as const, text: 'App', href: 'https://osmia.test/downtime?site=A&x=1' },
    ],
    footer: ['Footer'],
  };
  it('writes every piece of text escaped into the HTML part, and no link that is not http(s)', () => {
    const html = renderHtml(doc);
    expect(html).not.toMatch(/<img|<b>|<x>|href="javascript/);
    expect(html).toContain('Pump P-1 &lt;img src=x onerror=alert(1)&gt; stopped');
    expect(html).toContain('<title>Title &lt;b&gt;bold&lt;/b&gt;</title>');
    expect(html).toContain('href="https://osmia.test/downtime?site=A&amp;x=1"');
  });
  it('writes the same content as plain text, figures in aligned columns', () => {
    const text = renderText(doc);
    expect(text).toContain('Pump P-1 <img src=x onerror=alert(1)> stopped');
    expect(text).toMatch(/MTBF <x>\s+10\.0 h\s+70\.0 h/);
    expect(text).toContain('App: https://osmia.test/downtime?site=A&x=1');
  });
});

describe('appLink', () => {
  it('joins the public address and a page, keeping a path the app is served under', () => {
    expect(appLink('http://127.0.0.1:3000', '/nightly')).toBe('http://127.0.0.1:3000/nightly');
    expect(appLink('https://plant.osmia.test/osmia/', '/performance', { site: 'A B' })).toBe('https://plant.osmia.test/osmia/performance?site=A+B');
  });
});

describe('buildDigest', () => {
  const figures: NightlyFigures = {
    site: 'S1',
    timeZone: 'Europe/Berlin',
    windows: [
      { label: 'yesterday', from: '2025-03-01T23:00:00.000Z', to: '2025-03-02T23:00:00.000Z', reliability: { availability: 0.9, operationalAvailability: 0.95, mtbfHours: 20, mttrHours: 2, failures: 1 }, downtime: { events: 1, hours: 1.25, plannedHours: 0, unplannedHours: 1.25, lostVolumeM3: 125, cost: 106.25, currency: 'EUR' }, notes: [] },
      { label: 'last-7-days', from: '2025-02-23T23:00:00.000Z', to: '2025-03-02T23:00:00.000Z', reliability: { availability: null, operationalAvailability: 0.99, mtbfHours: null, mttrHours: null, failures: 0 }, downtime: { events: 2, hours: 1234.5, plannedHours: 0, unplannedHours: 1234.5, lostVolumeM3: 123450, cost: 104932.5, currency: 'EUR' }, notes: [] },
    ],
    alerts: [{ stage: 'T1-S1', kind: 'differential-pressure-rise', changePct: 16.2, thresholdPct: 15, since: '2025-03-01T23:00:00.000Z', message: 'Normalized differential pressure is 16.2 % above the baseline.' }],
  };
  const report: SiteReport = {
    site: { id: 1, code: 'S1', name: 'Site <one>', timeZone: 'Europe/Berlin' },
    figures,
    alerts: [{ ...figures.alerts[0], recommendation: 'Plan a clean-in-place.', cautions: [...cleaningCautions] }],
    stagesWithLatest: new Set(['T1-S1']),
    performanceAnswered: true,
  };
  const input = (role: Recipient['role']): DigestInput => ({
    recipient: { email: `${role}@osmia.test`, name: '', role, userId: 1 },
    reportDate: '2025-03-03',
    sites: [{ report, changes: { imports: [{ id: 7, kind: 'work-orders', file: 'orders <new>.csv', status: 'completed', rowsInserted: 4, rowsRejected: 0, finishedAt: new Date('2025-03-03T01:00:00Z') }], failures: [{ woNumber: 'WO-<9>', asset: 'P1', failureCode: 'SEAL', reportedAt: new Date('2025-03-02T10:00:00Z') }], alerts: [] } }],
    since: new Date('2025-03-02T01:00:00Z'),
    firstDigest: false,
    publicUrl: 'http://osmia.test:3000',
    attachments: [],
  });

  it('gives a manager reliability, downtime, the membrane alert with its cautions and the failures, but not the import list', () => {
    const mail = buildDigest(input('manager'));
    expect(mail.subject).toBe('Osmia nightly digest 2025-03-03 · S1 · 1 membrane alert');
    // 0.95 → "95.0 %"; 1,234.5 h with en-US grouping (one decimal, as server/mail/format.ts promises).
    expect(mail.text).toMatch(/Operational availability\s+95\.0 %\s+99\.0 %/);
    expect(mail.text).toMatch(/Downtime\s+1\.3 h\s+1,234\.5 h/);
    expect(mail.text).toMatch(/Downtime cost .*\s+106 EUR\s+104,933 EUR/);
    expect(mail.text).toContain('Failure recorded: WO-<9> on P1');
    expect(mail.text.replace(/\s+/g, ' ')).toContain(cleaningCautions[cleaningCautions.length - 1]);
    expect(mail.text).toContain('1 file imported.');
    expect(mail.text).not.toContain('orders <new>.csv');
    // Times in the site's zone (Europe/Berlin is UTC+1 in March before the change, IANA tz database).
    expect(mail.text.replace(/\s+/g, ' ')).toContain('2025-03-02 00:00 (Europe/Berlin) to 2025-03-03 00:00 (Europe/Berlin)');
    expect(mail.html).toContain('Site &lt;one&gt; (S1)');
    expect(mail.html).toContain('WO-&lt;9&gt;');
  });

  it('gives finance the downtime figures only: no reliability, no membrane alert, no failures', () => {
    const mail = buildDigest(input('finance'));
    expect(mail.subject).toBe('Osmia nightly digest 2025-03-03 · S1');
    expect(mail.text).toContain('Downtime cost');
    expect(mail.text).not.toMatch(/MTBF|availability|T1-S1|WO-<9>|Isolate the train/i);
  });

  it('gives an engineer the import list too, and attaches what is given', () => {
    const mail = buildDigest({ ...input('engineer'), attachments: [{ filename: 'week.xlsx', path: '/tmp/week.xlsx' }] });
    expect(mail.text).toContain('Imported orders <new>.csv (work orders): 4 rows added.');
    expect(mail.html).toContain('orders &lt;new&gt;.csv');
    expect(mail.text).toContain('Attached: week.xlsx.');
  });
});
