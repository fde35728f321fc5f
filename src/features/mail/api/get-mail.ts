import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { mailListSchema, mailMessageSchema, type MailList, type MailMessage } from '#shared/schemas/mail.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const mailPageSize = 25;

export const mailKeys = {
  all: ['mail'] as const,
  page: (offset: number) => [...mailKeys.all, 'page', offset] as const,
  message: (id: number) => [...mailKeys.all, 'message', id] as const,
};

/** GET /api/mail: one page of received messages, newest first, with the outbox. */
export function getMail(offset: number, signal?: AbortSignal): Promise<MailList> {
  return apiRequest(`/mail?limit=${mailPageSize}&offset=${offset}`, { schema: mailListSchema, signal });
}

export const mailQueryOptions = (offset = 0) => queryOptions({ queryKey: mailKeys.page(offset), queryFn: ({ signal }) => getMail(offset, signal) });

export function useMail(offset: number): MailList {
  return useSuspenseQuery(mailQueryOptions(offset)).data;
}

/** GET /api/mail/:id: one message with both parts. */
export function getMailMessage(id: number, signal?: AbortSignal): Promise<MailMessage> {
  return apiRequest(`/mail/${id}`, { schema: mailMessageSchema, signal });
}

export const mailMessageQueryOptions = (id: number) =>
  queryOptions({ queryKey: mailKeys.message(id), queryFn: ({ signal }) => getMailMessage(id, signal), staleTime: Infinity });

export function useMailMessage(id: number): MailMessage {
  return useSuspenseQuery(mailMessageQueryOptions(id)).data;
}
