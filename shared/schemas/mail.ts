// The messages the development mail server received (GET /api/mail, /api/mail/:id) and the outbox's state.
import { z } from 'zod';
import { count } from './answer.ts';
import { idSchema, isoInstantSchema, pageShape, pagingQuerySchema } from './common.ts';

export const mailAttachmentInfoSchema = z.object({ filename: z.string().nullable(), contentType: z.string(), size: count });

export const mailMessageSummarySchema = z.object({
  id: z.number().int(),
  receivedAt: isoInstantSchema,
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  attachments: z.array(mailAttachmentInfoSchema),
  size: count,
});
export type MailMessageSummary = z.infer<typeof mailMessageSummarySchema>;

export const mailMessageSchema = mailMessageSummarySchema.extend({
  envelopeFrom: z.string(),
  envelopeTo: z.array(z.string()),
  messageId: z.string().nullable(),
  /** The plain-text part. */
  text: z.string().nullable(),
  /** The HTML part as received: show it only in a sandboxed frame. */
  html: z.string().nullable(),
});
export type MailMessage = z.infer<typeof mailMessageSchema>;

/** What waits in the outbox (mail the SMTP server has not taken yet: retried by the next nightly run). */
export const outboxStatusSchema = z.object({
  waiting: count,
  sent: count,
  oldestWaitingAt: isoInstantSchema.nullable(),
  lastError: z.string().nullable(),
});
export type OutboxStatus = z.infer<typeof outboxStatusSchema>;

export const mailListQuerySchema = pagingQuerySchema;
export const mailListSchema = z.object({
  messages: z.array(mailMessageSummarySchema),
  ...pageShape,
  outbox: outboxStatusSchema,
  /** The SMTP server this server was given (host and port, never credentials); null when none. */
  relay: z.object({ host: z.string(), port: z.number().int(), secure: z.boolean() }).nullable(),
});
export type MailList = z.infer<typeof mailListSchema>;

export const mailIdParamsSchema = z.object({ id: idSchema });
