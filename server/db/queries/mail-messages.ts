import type { MailMessage, MailMessageSummary } from '#shared/schemas/mail.ts';
import type { Queryable } from './queryable.ts';

export interface ReceivedMail {
  envelopeFrom: string;
  envelopeTo: string[];
  from: string;
  to: string;
  subject: string;
  messageId: string | null;
  text: string | null;
  html: string | null;
  attachments: MailMessageSummary['attachments'];
  size: number;
}

export async function insertMailMessage(q: Queryable, m: ReceivedMail): Promise<number> {
  const { rows } = await q.query<{ id: number }>(
    `insert into mail_messages (envelope_from, envelope_to, from_header, to_header, subject, message_id, text, html, attachments, size)
     values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10) returning id`,
    [m.envelopeFrom, JSON.stringify(m.envelopeTo), m.from, m.to, m.subject, m.messageId, m.text, m.html, JSON.stringify(m.attachments), m.size],
  );
  return rows[0].id;
}

const summaryColumns = `id, received_at as "receivedAt", from_header as "from", to_header as "to", subject, attachments, size`;

export async function listMailMessages(q: Queryable, page: { limit: number; offset: number }): Promise<{ messages: MailMessageSummary[]; total: number }> {
  const [{ rows }, count] = await Promise.all([
    q.query<Omit<MailMessageSummary, 'receivedAt'> & { receivedAt: Date }>(`select ${summaryColumns} from mail_messages order by id desc limit $1 offset $2`, [page.limit, page.offset]),
    q.query<{ n: number }>(`select count(*)::int as n from mail_messages`),
  ]);
  return { messages: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })), total: count.rows[0].n };
}

export async function getMailMessage(q: Queryable, id: number): Promise<MailMessage | undefined> {
  const { rows } = await q.query<Omit<MailMessage, 'receivedAt'> & { receivedAt: Date }>(
    `select ${summaryColumns}, envelope_from as "envelopeFrom", envelope_to as "envelopeTo", message_id as "messageId", text, html
       from mail_messages where id = $1`,
    [id],
  );
  return rows[0] && { ...rows[0], receivedAt: rows[0].receivedAt.toISOString() };
}
