import type { MailKind } from '#shared/schemas/enums.ts';
import type { OutboxStatus } from '#shared/schemas/mail.ts';
import type { Queryable } from './queryable.ts';

export interface MailAttachment {
  filename: string;
  path: string;
}

export interface OutboxMessage {
  id: number;
  kind: MailKind;
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments: MailAttachment[];
  attempts: number;
}

/**
 * Put a message in the outbox unless one with the same key is there already (one digest per recipient and
 * day, one alert per crossing). Answers whether it was added.
 */
export async function queueMail(
  q: Queryable,
  m: { kind: MailKind; dedupeKey: string; to: string; subject: string; text: string; html: string; attachments: MailAttachment[]; nightlyRunId: number | null },
): Promise<boolean> {
  const { rowCount } = await q.query(
    `insert into outbox (kind, dedupe_key, to_address, subject, text, html, attachments, nightly_run_id)
     values ($1, $2, $3, $4, $5, $6, $7, $8) on conflict (dedupe_key) do nothing`,
    [m.kind, m.dedupeKey, m.to, m.subject, m.text, m.html, JSON.stringify(m.attachments), m.nightlyRunId],
  );
  return (rowCount ?? 0) > 0;
}

/** Every message not sent yet, oldest first. */
export async function listUnsentMail(q: Queryable): Promise<OutboxMessage[]> {
  const { rows } = await q.query<OutboxMessage>(
    `select id, kind, to_address as "to", subject, text, html, attachments, attempts from outbox where sent_at is null order by id`,
  );
  return rows;
}

export async function markMailSent(q: Queryable, id: number, messageId: string | null): Promise<void> {
  await q.query(`update outbox set sent_at = now(), attempts = attempts + 1, last_attempt_at = now(), last_error = null, message_id = $2 where id = $1`, [id, messageId]);
}

export async function markMailFailed(q: Queryable, id: number, error: string): Promise<void> {
  await q.query(`update outbox set attempts = attempts + 1, last_attempt_at = now(), last_error = $2 where id = $1`, [id, error]);
}

/** When the last digest to this address was queued, not counting the one with this key. */
export async function lastDigestAt(q: Queryable, to: string, exceptKey: string): Promise<Date | null> {
  const { rows } = await q.query<{ at: Date | null }>(
    `select max(created_at) as at from outbox where kind = 'digest' and lower(to_address) = lower($1) and dedupe_key <> $2`,
    [to, exceptKey],
  );
  return rows[0]?.at ?? null;
}

export async function outboxStatus(q: Queryable): Promise<OutboxStatus> {
  const { rows } = await q.query<{ waiting: number; sent: number; oldest: Date | null; last_error: string | null }>(
    `select count(*) filter (where sent_at is null)::int as waiting,
            count(*) filter (where sent_at is not null)::int as sent,
            min(created_at) filter (where sent_at is null) as oldest,
            (select last_error from outbox where sent_at is null and last_error is not null order by last_attempt_at desc limit 1) as last_error
       from outbox`,
  );
  const r = rows[0];
  return { waiting: r.waiting, sent: r.sent, oldestWaitingAt: r.oldest?.toISOString() ?? null, lastError: r.last_error };
}
