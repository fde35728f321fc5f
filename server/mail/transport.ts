// Sending mail over SMTP (nodemailer). SMTP_URL names the relay; in development and tests it is the
// development mail server on loopback (fake-smtp.ts), and a real relay replaces it by configuration alone.
import nodemailer from 'nodemailer';
import type { MailAttachment } from '../db/queries/outbox.ts';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments: readonly MailAttachment[];
}

export interface Mailer {
  /** host:port of the relay, never its credentials. */
  relay: string;
  send: (mail: OutgoingMail) => Promise<{ messageId: string | null }>;
  close: () => void;
}

/** Host, port and TLS of an SMTP URL (default ports: 587 for smtp://, 465 for smtps://, RFC 8314 §7.3 and RFC 6409). */
export function describeRelay(smtpUrl: string): { host: string; port: number; secure: boolean } {
  const u = new URL(smtpUrl);
  const secure = u.protocol === 'smtps:';
  return { host: u.hostname, port: u.port ? Number(u.port) : secure ? 465 : 587, secure };
}

/**
 * A mailer for the relay at `smtpUrl`. A relay that does not answer fails a message after 15 s, so a
 * nightly run never hangs on it; the message then stays in the outbox.
 */
export function createMailer(smtpUrl: string, from: string): Mailer {
  const relay = describeRelay(smtpUrl);
  const transport = nodemailer.createTransport({ url: smtpUrl, connectionTimeout: 15_000, greetingTimeout: 15_000, socketTimeout: 60_000 }, { from });
  return {
    relay: `${relay.host}:${relay.port}`,
    send: async (mail) => {
      const info = await transport.sendMail({ to: mail.to, subject: mail.subject, text: mail.text, html: mail.html, attachments: mail.attachments.map((a) => ({ filename: a.filename, path: a.path })) });
      return { messageId: info.messageId ?? null };
    },
    close: () => transport.close(),
  };
}

/**
 * Whether a send failed because of this one message (a recipient refused, an attachment missing) rather
 * than the relay (unreachable, refusing the sign-in): after a relay failure the other messages are not
 * tried, they would fail the same way.
 */
export function failedForThisMessageOnly(err: unknown): boolean {
  const code = (err as { code?: string } | null)?.code;
  // ESTREAM: an attachment could not be read (nodemailer keeps the file error, ENOENT…, in the message).
  return code === 'EENVELOPE' || code === 'EMESSAGE' || code === 'ESTREAM' || code === 'ENOENT' || code === 'EISDIR' || code === 'EACCES';
}
