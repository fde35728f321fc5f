import type { PagingQuery } from '#shared/schemas/common.ts';
import type { MailList, MailMessage } from '#shared/schemas/mail.ts';
import type { Db } from '../db/client.ts';
import { getMailMessage, listMailMessages } from '../db/queries/mail-messages.ts';
import { outboxStatus } from '../db/queries/outbox.ts';
import { notFound } from '../errors.ts';
import { describeRelay } from '../mail/transport.ts';

/** A page of what the development mail server received, newest first, with the outbox's state (GET /api/mail). */
export async function mailPage(db: Db, page: PagingQuery, smtpUrl: string | undefined): Promise<MailList> {
  const [{ messages, total }, outbox] = await Promise.all([listMailMessages(db.$client, page), outboxStatus(db.$client)]);
  return { messages, total, ...page, outbox, relay: smtpUrl ? describeRelay(smtpUrl) : null };
}

export async function mailMessage(db: Db, id: number): Promise<MailMessage> {
  const message = await getMailMessage(db.$client, id);
  if (!message) throw notFound('mail-not-found');
  return message;
}
