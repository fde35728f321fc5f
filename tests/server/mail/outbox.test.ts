// Mail goes through the outbox: written first, then sent with its attachments; a message the relay refuses on
// its own keeps its error while the others go, and a relay that is down stops the round (docs/design.md §7).
import { writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queueMail } from '#server/db/queries/outbox.ts';
import { startFakeSmtp, type FakeSmtp } from '#server/mail/fake-smtp.ts';
import { flushOutbox } from '#server/mail/outbox.ts';
import { createMailer } from '#server/mail/transport.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';

let t: TestDatabase;
let smtp: FakeSmtp;
const dir = mkdtempSync(join(tmpdir(), 'osmia-outbox-'));
beforeAll(async () => {
  t = await createTestDatabase();
  smtp = await startFakeSmtp(t.db);
});
afterAll(async () => {
  await smtp.close();
  await t.close();
});

const queue = (key: string, attachments: { filename: string; path: string }[] = []) =>
  queueMail(t.db.$client, { kind: 'digest', dedupeKey: key, to: `${key}@osmia.test`, subject: `Subject ${key}`, text: 'Text', html: '<p>HTML</p>', attachments, nightlyRunId: null });

describe('flushOutbox', () => {
  it('sends each message once with its attachments, and marks it sent', async () => {
    const workbook = join(dir, 'week.xlsx');
    writeFileSync(workbook, Buffer.alloc(2048, 7));
    expect(await queue('with-workbook', [{ filename: 'week.xlsx', path: workbook }])).toBe(true);
    // The same key again is not a second message (one digest per recipient and day).
    expect(await queue('with-workbook')).toBe(false);
    const mailer = createMailer(smtp.url, 'Osmia <osmia@osmia.test>');
    expect(await flushOutbox(t.db, mailer)).toEqual({ sent: 1, waiting: 0, error: null });
    expect(await flushOutbox(t.db, mailer)).toEqual({ sent: 0, waiting: 0, error: null });
    mailer.close();
    const { rows } = await t.db.$client.query(`select subject, attachments from mail_messages`);
    expect(rows).toEqual([{ subject: 'Subject with-workbook', attachments: [expect.objectContaining({ filename: 'week.xlsx', size: 2048 })] }]);
  });

  it('keeps a message whose attachment is missing, with the reason, and sends the others', async () => {
    await queue('missing-file', [{ filename: 'gone.xlsx', path: join(dir, 'gone.xlsx') }]);
    await queue('plain');
    const mailer = createMailer(smtp.url, 'Osmia <osmia@osmia.test>');
    const result = await flushOutbox(t.db, mailer);
    mailer.close();
    expect(result).toMatchObject({ sent: 1, waiting: 1, error: expect.stringMatching(/ENOENT/) });
    const { rows } = await t.db.$client.query(`select dedupe_key, attempts, sent_at is not null as sent, last_error from outbox where dedupe_key in ('missing-file', 'plain') order by id`);
    expect(rows.map((r) => [r.dedupe_key, r.attempts, r.sent])).toEqual([
      ['missing-file', 1, false],
      ['plain', 1, true],
    ]);
  });

  it('without a mailer sends nothing and keeps the reason on each message', async () => {
    const result = await flushOutbox(t.db, null, 'SMTP_URL is not set');
    expect(result).toEqual({ sent: 0, waiting: 1, error: 'SMTP_URL is not set' });
    const { rows } = await t.db.$client.query(`select last_error, attempts from outbox where dedupe_key = 'missing-file'`);
    expect(rows[0]).toEqual({ last_error: 'SMTP_URL is not set', attempts: 2 });
  });
});
