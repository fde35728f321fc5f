// `osmia serve` (what `npm start` runs) starts the development mail server when SMTP_URL is not set, and
// tells the server its address; with SMTP_URL set, none is started (docs/design.md §8).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailListSchema } from '#shared/schemas/mail.ts';
import { createMailer } from '#server/mail/transport.ts';
import { createUser } from '#server/services/users.ts';
import { createTestDatabase, type TestDatabase } from '../setup/db.ts';
import { spawnCli } from '../setup/cli.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await createUser(t.db, { email: 'admin@osmia.test', name: 'Admin', role: 'admin', password: 'admin-password-1' }, 4);
});
afterAll(() => t.close());

/** Start `osmia serve` on a free port and wait for the line with its address. */
async function serve(env: Record<string, string>) {
  const child = spawnCli(t.url, ['serve', '--port', '0'], { BCRYPT_COST: '4', ...env });
  let exited = false;
  void child.done.then(() => (exited = true));
  for (let i = 0; !/Osmia is running at (http:\/\/\S+)/.test(child.output().out); i++) {
    if (exited || i > 400) throw new Error(`serve did not start: ${JSON.stringify(child.output())}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  const url = /Osmia is running at (http:\/\/\S+)/.exec(child.output().out)![1];
  return { child, url };
}

async function mailList(url: string) {
  const login = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email: 'admin@osmia.test', password: 'admin-password-1' }) });
  expect(login.status).toBe(200);
  const cookie = login.headers.get('set-cookie')!.split(';')[0];
  return mailListSchema.parse(await (await fetch(`${url}/api/mail`, { headers: { Cookie: cookie } })).json());
}

describe('osmia serve and the development mail server', () => {
  it('starts one on loopback without SMTP_URL: mail sent to it is listed by the server it told', async () => {
    const { child, url } = await serve({ SMTP_URL: '' });
    try {
      const smtpUrl = /Development mail server at (smtp:\/\/127\.0\.0\.1:\d+)/.exec(child.output().out)?.[1];
      expect(smtpUrl, child.output().out).toBeDefined();
      const mailer = createMailer(smtpUrl!, 'Osmia <osmia@osmia.test>');
      await mailer.send({ to: 'manager@osmia.test', subject: 'Through the development mail server', text: 'Hello.', html: '<p>Hello.</p>', attachments: [] });
      mailer.close();
      const list = await mailList(url);
      expect(list.relay).toEqual({ host: '127.0.0.1', port: Number(new URL(smtpUrl!).port), secure: false });
      expect(list.messages.map((m) => m.subject)).toContain('Through the development mail server');
    } finally {
      process.kill(child.child.pid!, 'SIGTERM');
    }
    expect((await child.done).code).toBe(0);
  });

  it('starts none when SMTP_URL names a relay, and the server reports that relay', async () => {
    const { child, url } = await serve({ SMTP_URL: 'smtp://mail.osmia.test:2525' });
    try {
      expect(child.output().out).not.toContain('Development mail server');
      expect((await mailList(url)).relay).toEqual({ host: 'mail.osmia.test', port: 2525, secure: false });
    } finally {
      process.kill(child.child.pid!, 'SIGTERM');
    }
    expect((await child.done).code).toBe(0);
  });
});
