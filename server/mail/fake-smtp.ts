// The development mail server: a real SMTP server (smtp-server) on loopback that keeps what it receives in
// mail_messages, where admins read it on the Mail page. `npm start`, `osmia nightly` and `osmia schedule`
// start one when SMTP_URL is not set outside production; the tests start their own. It accepts any sender
// and recipient, asks no password and offers no TLS: it listens on 127.0.0.1 only and delivers nowhere.
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Db } from '../db/client.ts';
import { insertMailMessage } from '../db/queries/mail-messages.ts';

export interface FakeSmtp {
  url: string;
  port: number;
  close: () => Promise<void>;
}

/** Largest message kept (25 MB, a common relay limit): a workbook attachment fits. */
const maxBytes = 25 * 1024 * 1024;

const addressText = (a: AddressObject | AddressObject[] | undefined) => (a === undefined ? '' : (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', '));

export async function startFakeSmtp(db: Db, options: { port?: number; log?: (line: string) => void } = {}): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: maxBytes,
    logger: false,
    banner: 'Osmia development mail server: messages are kept for the Mail page, never delivered',
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        if (stream.sizeExceeded) return callback(Object.assign(new Error(`Message larger than ${maxBytes} bytes`), { responseCode: 552 }));
        const raw = Buffer.concat(chunks);
        simpleParser(raw)
          .then((mail) =>
            insertMailMessage(db.$client, {
              envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              envelopeTo: session.envelope.rcptTo.map((r) => r.address),
              from: addressText(mail.from),
              to: addressText(mail.to),
              subject: mail.subject ?? '',
              messageId: mail.messageId ?? null,
              text: mail.text ?? null,
              html: typeof mail.html === 'string' ? mail.html : null,
              attachments: mail.attachments.map((a) => ({ filename: a.filename ?? null, contentType: a.contentType, size: a.size })),
              size: raw.length,
            }),
          )
          .then(
            () => callback(),
            (err: Error) => {
              options.log?.(`development mail server: could not keep a message: ${err.message}`);
              callback(Object.assign(new Error('Message not kept, try again later'), { responseCode: 451 }));
            },
          );
      });
    },
  });
  server.on('error', (err) => options.log?.(`development mail server: ${err.message}`));
  await new Promise<void>((resolve, reject) => {
    const onError = (err: Error) => reject(err);
    server.server.once('error', onError);
    server.listen(options.port ?? 0, '127.0.0.1', () => {
      server.server.off('error', onError);
      resolve();
    });
  });
  const port = (server.server.address() as AddressInfo).port;
  return { url: `smtp://127.0.0.1:${port}`, port, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
