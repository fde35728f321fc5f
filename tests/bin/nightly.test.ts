// `osmia nightly` through the real launcher against a test database and a real SMTP server on loopback
// (the development mail server, server/mail/fake-smtp.ts, started here): the inbox imported in dependency
// order, the digest with the API's figures, nothing imported twice, failed files set aside with their
// reason, mail kept in the outbox while the relay is down, a run killed with kill -9, two runs at once,
// and `osmia schedule`. Steps build on each other, in order, on one database.
import { copyFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nightlyRunSchema, type NightlyRun } from '#shared/schemas/nightly.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { mailListSchema, mailMessageSchema } from '#shared/schemas/mail.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { deferToPracticeCaution, isolateAndDepressurizeCaution, lockOutTagOutCaution } from '#shared/cautions.ts';
import { startFakeSmtp, type FakeSmtp } from '#server/mail/fake-smtp.ts';
import { createMailer } from '#server/mail/transport.ts';
import { assetsCsv, elementsCsv, historianCsv, tagsCsv, workOrdersCsv } from '../fixtures/ops-plant.ts';
import { createTestApp, type TestApp } from '../setup/app.ts';
import { spawnCli } from '../setup/cli.ts';

let t: TestApp;
let smtp: FakeSmtp;
let inbox: string;
let reportsDir: string;
const mailEnv = { MAIL_FROM: 'Osmia <osmia@osmia.test>', PUBLIC_URL: 'http://osmia.test:3000' };

beforeAll(async () => {
  t = await createTestApp();
  smtp = await startFakeSmtp(t.db);
  inbox = mkdtempSync(join(tmpdir(), 'osmia-inbox-'));
  reportsDir = mkdtempSync(join(tmpdir(), 'osmia-reports-'));
  // The manager and the engineer subscribe themselves; the admin subscribes the finance user.
  for (const role of ['manager', 'engineer'] as const) {
    const res = await request(t.app).patch('/api/auth/me').set('Cookie', t.cookies[role]).send({ digest: true });
    expect(res.status).toBe(200);
    expect(res.body.user.digest).toBe(true);
  }
  const finance = (await t.db.query.users.findMany()).find((u) => u.role === 'finance')!;
  expect((await request(t.app).patch(`/api/users/${finance.id}`).set('Cookie', t.cookies.admin).send({ digest: true })).body.digest).toBe(true);
});

afterAll(async () => {
  await smtp?.close();
  await t?.close();
});

function nightly(args: string[], env: Record<string, string> = {}) {
  return spawnCli(t.url, ['nightly', '--inbox', inbox, '--json', ...args], { SMTP_URL: smtp.url, REPORTS_DIR: reportsDir, ...mailEnv, ...env });
}

async function runNightly(args: string[], env: Record<string, string> = {}): Promise<{ code: number | null; run: NightlyRun; err: string }> {
  const r = await nightly(args, env).done;
  let run: NightlyRun;
  try {
    run = nightlyRunSchema.parse(JSON.parse(r.out));
  } catch (err) {
    throw new Error(`nightly printed no run record (exit ${r.code}): ${r.out}\n${r.err}`, { cause: err });
  }
  return { code: r.code, run, err: r.err };
}

interface Received {
  id: number;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string | null; contentType: string; size: number }[];
}

async function received(): Promise<Received[]> {
  const { rows } = await t.db.$client.query<Received>(`select id, to_header as "to", subject, text, html, attachments from mail_messages order by id`);
  return rows;
}

async function importCount(): Promise<number> {
  return Number((await t.db.$client.query(`select count(*) as n from imports`)).rows[0].n);
}

/** The calendar day `days` from an ISO day. */
const addDaysIso = (day: string, days: number) => new Date(Date.parse(`${day}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

const put = (name: string, content: string) => writeFileSync(join(inbox, name), content);
const waiting = () => readdirSync(inbox, { withFileTypes: true }).filter((e) => e.isFile()).map((e) => e.name);
// How the digest writes figures (server/mail/format.ts), written out again here: one decimal, en-US grouping.
const oneDecimal = (x: number) => x.toLocaleString('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 });

describe('osmia nightly', () => {
  const firstDay = '2025-01-08';

  it('imports the inbox in dependency order, refreshes once, moves each file to done/<date>/ and mails each subscriber a digest with the API’s figures', async () => {
    // Named so that their alphabetical order is the reverse of the order they must be imported in, and
    // one name that is markup (the digest lists file names: its HTML part must show it as text).
    put('1-readings.csv', historianCsv());
    put('2-orders.csv', workOrdersCsv);
    put('3-installs.csv', elementsCsv);
    put('4-map.csv', tagsCsv);
    put('5-<em>plant.csv', assetsCsv);
    const { code, run, err } = await runNightly(['--site', 'OPS', '--tz', 'UTC', '--today', firstDay]);
    expect(code, err).toBe(0);
    expect(run).toMatchObject({ outcome: 'ok', trigger: 'cli', reportDate: firstDay, error: null });
    // docs/design.md §5: what a file refers to is imported first (assets, tags, elements, work orders, job steps, historian).
    expect(run.files.map((f) => [f.file, f.kind, f.outcome])).toEqual([
      ['5-<em>plant.csv', 'assets', 'completed'],
      ['4-map.csv', 'tags', 'completed'],
      ['3-installs.csv', 'elements', 'completed'],
      ['2-orders.csv', 'work-orders', 'completed'],
      ['1-readings.csv', 'historian', 'completed'],
    ]);
    expect(run.steps.map((s) => [s.name, s.status])).toEqual([
      ['imports', 'ok'],
      ['refresh', 'ok'],
      ['workbooks', 'ok'],
      ['mail', 'ok'],
    ]);
    expect(waiting()).toEqual([]);
    for (const f of run.files) {
      expect(f.movedTo).toMatch(/^done\/\d{4}-\d{2}-\d{2}\//);
      expect(existsSync(join(inbox, f.movedTo!))).toBe(true);
    }
    // Through the one import path, refresh deferred and done once at the end: every import is included in
    // the derived tables, and recorded as the nightly run's.
    const history = await request(t.app).get('/api/imports').set('Cookie', t.cookies.engineer);
    expect(history.body.imports).toHaveLength(5);
    for (const i of history.body.imports) expect(i).toMatchObject({ status: 'completed', actor: 'nightly', derivedRefreshed: true, site: 'OPS' });

    // The digest's figures are the API's for the same windows (the KPI catalog answers both).
    const [day, week] = run.figures[0].windows;
    expect([day.label, week.label]).toEqual(['yesterday', 'last-7-days']);
    expect([day.from, day.to, week.from]).toEqual(['2025-01-07T00:00:00.000Z', '2025-01-08T00:00:00.000Z', '2025-01-01T00:00:00.000Z']);
    for (const [w, from] of [
      [day, '2025-01-07'],
      [week, '2025-01-01'],
    ] as const) {
      const rel = reliabilityReportSchema.parse((await request(t.app).get(`/api/kpi/reliability?site=OPS&from=${from}&to=${firstDay}`).set('Cookie', t.cookies.manager)).body);
      expect(w.reliability).toEqual({ availability: rel.availability, operationalAvailability: rel.operationalAvailability ?? null, mtbfHours: rel.mtbfHours, mttrHours: rel.mttrHours, failures: rel.failures });
      const down = downtimeReportSchema.parse((await request(t.app).get(`/api/kpi/downtime?site=OPS&from=${from}&to=${firstDay}`).set('Cookie', t.cookies.finance)).body);
      expect(w.downtime).toEqual({ ...down.plant, currency: down.currency ?? null });
    }
    // Hand-checked against tests/fixtures/ops-plant.ts: on Jan 7 train TR1 stood 00:00–08:00 (8 h) and the
    // bearing failure WO-2 was reported; over Jan 1–7 TR1 stopped 12 h + 8 h and TR2-P1 10 h (the fixture's own figures).
    expect(day.reliability!.failures).toBe(1);
    expect(day.downtime!.hours).toBeCloseTo(8, 9);
    expect(week.downtime!.hours).toBeCloseTo(30, 9);
    // TR1-S2's permeate flow is 12 % down from Jan 6 (fixture): past the −10 % threshold (docs/design.md §6, common practice).
    expect(run.figures[0].alerts.map((a) => [a.stage, a.kind])).toEqual([['TR1-S2', 'permeate-flow-drop']]);

    const mail = await received();
    const digests = mail.filter((m) => m.subject.startsWith('Osmia nightly digest'));
    expect(digests.map((m) => m.to).sort()).toEqual(['engineer@test.example', 'finance@test.example', 'manager@test.example']);
    const manager = digests.find((m) => m.to === 'manager@test.example')!;
    const rel = day.reliability!;
    // One decimal, as the digest promises: the API's operational availability of yesterday, MTBF of the week.
    expect(manager.text).toContain(`${oneDecimal(rel.operationalAvailability! * 100)} %`);
    expect(manager.text).toContain(`${oneDecimal(week.reliability!.mtbfHours!)} h`);
    expect(manager.text).toContain(`${oneDecimal(day.downtime!.hours)} h`);
    expect(manager.text).toContain('TR1-S2');
    expect(manager.text).toContain('http://osmia.test:3000/');
    // Finance reads downtime and its cost, not reliability or membrane performance (docs/design.md §2).
    const finance = digests.find((m) => m.to === 'finance@test.example')!;
    expect(finance.text).toContain('Downtime cost');
    expect(finance.text).toContain(`${oneDecimal(week.downtime!.hours)} h`);
    expect(finance.text).not.toMatch(/MTBF|Membrane alert|TR1-S2/);
    // Both parts of multipart/alternative (RFC 2046 §5.1.4), the file name escaped in the HTML part (HTML
    // standard, "escapingString": < and > as &lt; &gt;).
    const engineer = digests.find((m) => m.to === 'engineer@test.example')!;
    expect(engineer.text).toContain('5-<em>plant.csv');
    expect(engineer.html).toContain('5-&lt;em&gt;plant.csv');
    expect(engineer.html).not.toContain('<em>plant');

    // The day's workbooks (last 7 days) in reports/<date>/, each attached to the digest of the roles that may
    // have it (docs/design.md §2): finance gets finance and manager, the engineer engineer and manager.
    const week7 = `OPS-${addDaysIso(firstDay, -7)}-${firstDay}.xlsx`;
    expect(readdirSync(join(reportsDir, firstDay)).sort()).toEqual([`engineer-${week7}`, `finance-${week7}`, `manager-${week7}`]);
    const attached = (m: Received) => m.attachments.map((a) => a.filename).sort();
    expect(attached(manager)).toEqual([`manager-${week7}`]);
    expect(attached(finance)).toEqual([`finance-${week7}`, `manager-${week7}`]);
    expect(attached(engineer)).toEqual([`engineer-${week7}`, `manager-${week7}`]);
    expect(manager.attachments[0]!.contentType).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    const book = new ExcelJS.Workbook();
    await book.xlsx.readFile(join(reportsDir, firstDay, `manager-${week7}`));
    expect(book.worksheets.length).toBeGreaterThan(1);

    // The membrane alert, to those whose role reads membrane performance, with the cleaning cautions (docs/design.md §9).
    const alerts = mail.filter((m) => m.subject.startsWith('Osmia membrane alert'));
    expect(alerts.map((m) => m.to).sort()).toEqual(['engineer@test.example', 'manager@test.example']);
    for (const caution of [isolateAndDepressurizeCaution, lockOutTagOutCaution, deferToPracticeCaution]) {
      expect(alerts[0].text.replace(/\s+/g, ' ')).toContain(caution);
    }
    // The admin reads each message on the Mail page's API, text and HTML as received.
    const list = mailListSchema.parse((await request(t.app).get('/api/mail').set('Cookie', t.cookies.admin)).body);
    expect(list.total).toBe(mail.length);
    expect(list.outbox).toMatchObject({ waiting: 0, sent: mail.length });
    const one = mailMessageSchema.parse((await request(t.app).get(`/api/mail/${manager.id}`).set('Cookie', t.cookies.admin)).body);
    expect(one.text).toBe(manager.text);
    expect(one.envelopeTo).toEqual(['manager@test.example']);
  });

  it('imports nothing twice: a file whose content already landed is moved to done/ as already imported, and no second digest goes out for the same day', async () => {
    const before = { imports: await importCount(), mail: (await received()).length };
    put('again-plant.csv', assetsCsv);
    put('again-readings.csv', historianCsv());
    const { code, run } = await runNightly(['--site', 'OPS', '--today', firstDay]);
    expect(code).toBe(0);
    expect(run.files.map((f) => [f.file, f.outcome])).toEqual([
      ['again-plant.csv', 'already-imported'],
      ['again-readings.csv', 'already-imported'],
    ]);
    expect(run.files.every((f) => f.movedTo?.startsWith('done/'))).toBe(true);
    expect(await importCount()).toBe(before.imports);
    // One digest per recipient and day; the alert was mailed when it was first crossed, not again.
    expect((await received()).length).toBe(before.mail);
    expect(run.mail).toMatchObject({ queued: 0, sent: 0, waiting: 0 });
  });

  it('sets a file it cannot import aside in failed/<date>/ with its reason, imports the rest, and mails the failure to subscribers who may see imports', async () => {
    put('notes.csv', 'when,what\n2025-01-08,coffee\n');
    put('unknown-tag.csv', 'timestamp,NOT.A.TAG\n2025-01-08T00:00:00Z,1\n');
    put('steps.csv', 'wo_number,step,name,started_at,completed_at,guided,technician\nWO-1,1,Isolate the pump,2025-01-03T07:00:00Z,2025-01-03T08:00:00Z,yes,T. One\nWO-1,2,Replace the seal,2025-01-03T08:00:00Z,2025-01-03T14:00:00Z,yes,T. One\n');
    const { code, run } = await runNightly(['--site', 'OPS', '--today', '2025-01-09']);
    // docs/design.md §7: exit 3 when the run finished but a file did not go in.
    expect(code).toBe(3);
    expect(run.outcome).toBe('partial');
    const byName = Object.fromEntries(run.files.map((f) => [f.file, f]));
    expect(byName['steps.csv']).toMatchObject({ kind: 'job-steps', outcome: 'completed', rowsRejected: 0 });
    expect(byName['notes.csv']).toMatchObject({ kind: null, outcome: 'failed' });
    expect(byName['unknown-tag.csv']).toMatchObject({ kind: 'historian', outcome: 'failed' });
    for (const name of ['notes.csv', 'unknown-tag.csv']) {
      const f = byName[name];
      expect(f.movedTo).toMatch(/^failed\/\d{4}-\d{2}-\d{2}\//);
      const reason = readFileSync(join(inbox, `${f.movedTo}.reason.txt`), 'utf8');
      expect(reason).toContain(f.reason!);
    }
    expect(byName['notes.csv'].reason).toMatch(/none of the import formats/);
    expect(byName['unknown-tag.csv'].reason).toMatch(/NOT\.A\.TAG/);
    const mail = (await received()).filter((m) => m.subject.startsWith('Osmia nightly import failed'));
    expect(mail.map((m) => m.to)).toEqual(['engineer@test.example']);
    expect(mail[0].text).toContain('notes.csv');
    expect(mail[0].text).toContain('unknown-tag.csv');
    // A new day, a new digest for each subscriber.
    expect((await received()).filter((m) => m.subject.startsWith('Osmia nightly digest 2025-01-09')).length).toBe(3);
  });

  it('with the SMTP server down finishes the imports, keeps the mail in the outbox, and sends it on the next run', async () => {
    const closedPort = await new Promise<number>((resolve) => {
      const s = createServer().listen(0, '127.0.0.1', () => {
        const port = (s.address() as { port: number }).port;
        s.close(() => resolve(port));
      });
    });
    const before = (await received()).length;
    put('late-orders.csv', workOrdersCsv.replace('WO-9,TR1-HPP,corrective,high,closed,SEAL-LEAK,Earlier seal leak', 'WO-9,TR1-HPP,corrective,high,closed,SEAL-LEAK,Earlier seal leak (checked)'));
    const down = await runNightly(['--site', 'OPS', '--today', '2025-01-10'], { SMTP_URL: `smtp://127.0.0.1:${closedPort}` });
    expect(down.code).toBe(3);
    expect(down.run.files.map((f) => [f.file, f.outcome])).toEqual([['late-orders.csv', 'completed']]);
    expect(down.run.steps.find((s) => s.name === 'refresh')!.status).toBe('ok');
    expect(down.run.steps.find((s) => s.name === 'mail')).toMatchObject({ status: 'failed', error: expect.stringMatching(/wait in the outbox/) });
    expect(down.run.mail).toMatchObject({ queued: 3, sent: 0, waiting: 3 });
    expect((await received()).length).toBe(before);
    const { rows: waitingMail } = await t.db.$client.query(`select to_address, attempts, last_error from outbox where sent_at is null order by id`);
    expect(waitingMail.map((m) => m.to_address).sort()).toEqual(['engineer@test.example', 'finance@test.example', 'manager@test.example']);
    expect(waitingMail.map((m) => m.attempts)).toEqual([1, 0, 0]);
    expect(waitingMail[0].last_error).toMatch(/ECONNECTION|ECONNREFUSED/);

    const up = await runNightly(['--site', 'OPS', '--today', '2025-01-10']);
    expect(up.code).toBe(0);
    expect(up.run.files).toEqual([]);
    expect(up.run.mail).toMatchObject({ queued: 0, sent: 3, waiting: 0 });
    const arrived = (await received()).slice(before);
    expect(arrived.map((m) => m.subject.slice(0, 31))).toEqual(Array(3).fill('Osmia nightly digest 2025-01-10'));
    // The relay refused the first message's connection; the other two were not tried after that (they would
    // have failed the same way), so the first was attempted twice, the others once.
    const { rows: sent } = await t.db.$client.query(`select attempts from outbox where dedupe_key like 'digest:2025-01-10:%' order by id`);
    expect(sent.map((r) => r.attempts)).toEqual([2, 1, 1]);
  });

  it('killed with kill -9 mid-import, then run again, ends with every file in done/ and each imported once; a second run meanwhile does nothing', async () => {
    // A big historian export (known tags, after the fixture's data) so that the import is still copying when killed.
    const rows = 450_000;
    const lines = ['timestamp,tag,value,quality'];
    const start = Date.UTC(2025, 1, 1);
    for (let i = 0; i < rows / 3; i++) {
      const ts = new Date(start + i * 60_000).toISOString();
      lines.push(`${ts},TR1.RUN,1,good`, `${ts},S1.PF,${12 + (i % 7) / 10},good`, `${ts},S1.QP,10,good`);
    }
    put('big-readings.csv', lines.join('\n') + '\n');
    copyFileSync(join(inbox, 'big-readings.csv'), join(tmpdir(), 'osmia-big-readings.csv'));
    const samplesBefore = Number((await t.db.$client.query(`select count(*) as n from samples`)).rows[0].n);

    // The test holds the historian importer's per-site lock (pg_advisory_xact_lock(3, site), taken inside the
    // import's transaction), so the first run waits mid-import while a second run is started beside it.
    const { rows: site } = await t.db.$client.query(`select id from sites where code = 'OPS'`);
    const holder = await t.db.$client.connect();
    await holder.query('select pg_advisory_lock(3, $1)', [site[0].id]);
    const first = nightly(['--site', 'OPS', '--today', '2025-02-01']);
    const poll = async (what: string, sql: string, params: unknown[] = []) => {
      for (let i = 0; !(await t.db.$client.query(sql, params)).rowCount; i++) {
        if (i > 1500) throw new Error(`${what} never happened: ${JSON.stringify(first.output())}`);
        await new Promise((r) => setTimeout(r, 20));
      }
    };
    await poll('the import waiting for its site', `select 1 from pg_locks where locktype = 'advisory' and classid = 3 and objid = $1 and not granted`, [site[0].id]);
    // Two runs at once: the second finds the nightly lock taken, says so, and does nothing (exit 0).
    const second = await runNightly(['--site', 'OPS', '--today', '2025-02-01']);
    expect(second.code).toBe(0);
    expect(second.run).toMatchObject({ outcome: 'skipped', files: [], steps: [] });
    expect(second.run.error).toMatch(/^another nightly run is in progress since \d{4}-\d{2}-\d{2} \d{2}:\d{2} \(UTC\)/);
    expect(waiting()).toEqual(['big-readings.csv']);
    await holder.query('select pg_advisory_unlock(3, $1)', [site[0].id]);
    holder.release();
    await poll('the copy of the samples', `select 1 from pg_stat_progress_copy p join pg_class c on c.oid = p.relid where c.relname = 'samples' and p.tuples_processed > 1000`);
    process.kill(-first.child.pid!, 'SIGKILL');
    expect((await first.done).signal).toBe('SIGKILL');
    // PostgreSQL notices the dead client and rolls its transaction back (docs/design.md §5: atomic imports).
    for (let i = 0; i < 200 && (await t.db.$client.query(`select 1 from pg_stat_progress_copy`)).rowCount; i++) await new Promise((r) => setTimeout(r, 50));
    expect(Number((await t.db.$client.query(`select count(*) as n from samples`)).rows[0].n)).toBe(samplesBefore);
    expect(waiting()).toEqual(['big-readings.csv']);

    const again = await runNightly(['--site', 'OPS', '--today', '2025-02-01']);
    expect(again.code, again.err).toBe(0);
    expect(again.run.files).toMatchObject([{ file: 'big-readings.csv', kind: 'historian', outcome: 'completed', rowsRead: rows }]);
    expect(waiting()).toEqual([]);
    expect(Number((await t.db.$client.query(`select count(*) as n from samples`)).rows[0].n)).toBe(samplesBefore + rows);
    const { rows: landed } = await t.db.$client.query(`select count(*)::int as n from imports where file_name = 'big-readings.csv' and status in ('completed', 'partial')`);
    expect(landed[0].n).toBe(1);
    const { rows: runs } = await t.db.$client.query(`select outcome, error from nightly_runs where id < $1 order by id desc limit 2`, [again.run.id]);
    expect(runs.map((r) => r.outcome).sort()).toEqual(['failed', 'skipped']);
    expect(runs.find((r) => r.outcome === 'failed').error).toMatch(/interrupted/);

    // The same export delivered once more is recognised by its content and not imported again.
    copyFileSync(join(tmpdir(), 'osmia-big-readings.csv'), join(inbox, 'big-readings.csv'));
    const third = await runNightly(['--site', 'OPS', '--today', '2025-02-01']);
    expect(third.run.files).toMatchObject([{ file: 'big-readings.csv', outcome: 'already-imported', importId: again.run.files[0].importId }]);
    expect(third.run.files[0].movedTo).toMatch(/^done\/\d{4}-\d{2}-\d{2}\/big-readings-2\.csv$/);
  });

  it('`osmia schedule` runs the job on its cron expression, logs each run, and stops cleanly on SIGTERM', async () => {
    const scheduleInbox = mkdtempSync(join(tmpdir(), 'osmia-schedule-'));
    const before = Number((await t.db.$client.query(`select count(*) as n from nightly_runs where trigger = 'schedule'`)).rows[0].n);
    // Six fields: seconds first (croner's extension of the five-field crontab of POSIX): every two seconds.
    const child = spawnCli(t.url, ['schedule', '--inbox', scheduleInbox], { SMTP_URL: smtp.url, ...mailEnv, NIGHTLY_CRON: '*/2 * * * * *' });
    for (let i = 0; ; i++) {
      const { rows } = await t.db.$client.query(`select count(*)::int as n from nightly_runs where trigger = 'schedule' and finished_at is not null`);
      if (rows[0].n > before) break;
      if (i > 600) throw new Error(`no scheduled run: ${JSON.stringify(child.output())}`);
      await new Promise((r) => setTimeout(r, 100));
    }
    process.kill(child.child.pid!, 'SIGTERM');
    const ended = await child.done;
    expect(ended.code).toBe(0);
    expect(ended.out).toMatch(/schedule: nightly at "\*\/2 \* \* \* \* \*" \(UTC\)/);
    expect(ended.out).toMatch(/nightly run \d+: ok/);
    expect(ended.out.trimEnd()).toMatch(/schedule stopped$/);
  });
});

describe('the development mail server', () => {
  it('keeps a message sent to it over SMTP with its envelope, headers and both parts', async () => {
    const before = (await received()).length;
    const mailer = createMailer(smtp.url, 'Osmia <osmia@osmia.test>');
    // A subject outside ASCII travels as an RFC 2047 encoded word and must come back as written.
    await mailer.send({ to: 'admin@osmia.test', subject: 'Grüße aus der Anlage', text: 'Plain text body.', html: '<p>Plain text body.</p>', attachments: [] });
    mailer.close();
    const after = await received();
    expect(after.length).toBe(before + 1);
    expect(after[after.length - 1]).toMatchObject({ to: 'admin@osmia.test', subject: 'Grüße aus der Anlage', text: 'Plain text body.', html: '<p>Plain text body.</p>' });
  });
});
