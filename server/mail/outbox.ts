// Sending what waits in the outbox: every message is written there first (by the nightly run), then sent;
// one the relay did not take keeps its error and is tried again by the next run.
import type { Db } from '../db/client.ts';
import { listUnsentMail, markMailFailed, markMailSent } from '../db/queries/outbox.ts';
import { failedForThisMessageOnly, type Mailer } from './transport.ts';

export interface FlushResult {
  sent: number;
  waiting: number;
  /** The first error, when something was not sent. */
  error: string | null;
}

const errorText = (err: unknown) => {
  const e = err as { code?: string; message?: string; response?: string };
  return [e.code, e.message ?? String(err)].filter(Boolean).join(': ').slice(0, 1000);
};

/**
 * Send every unsent message, oldest first. Without a mailer (no SMTP server configured) nothing is sent and
 * each message keeps that reason. A relay failure stops the round (the rest would fail the same way); a
 * message refused on its own is marked and the next one is tried. A message the relay took but whose
 * "sent" mark was lost (a crash in between) is sent again next time: at least once, never silently dropped.
 */
export async function flushOutbox(db: Db, mailer: Mailer | null, noMailerReason = 'SMTP_URL is not set: no SMTP server to send through'): Promise<FlushResult> {
  const unsent = await listUnsentMail(db.$client);
  let sent = 0;
  let error: string | null = null;
  for (const [i, m] of unsent.entries()) {
    if (!mailer) {
      await markMailFailed(db.$client, m.id, noMailerReason);
      error = noMailerReason;
      continue;
    }
    try {
      const { messageId } = await mailer.send(m);
      await markMailSent(db.$client, m.id, messageId);
      sent++;
    } catch (err) {
      const text = errorText(err);
      await markMailFailed(db.$client, m.id, text);
      error ??= text;
      if (!failedForThisMessageOnly(err)) {
        return { sent, waiting: unsent.length - sent, error: `${text} (${unsent.length - i - 1} more not tried)` };
      }
    }
  }
  return { sent, waiting: unsent.length - sent, error };
}
