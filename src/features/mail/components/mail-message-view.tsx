import type { MailMessage } from '#shared/schemas/mail.ts';
import { formatDateTime, formatNumber } from '../../../lib/format.ts';
import { useMailMessage } from '../api/get-mail.ts';

const bytes = (n: number) => (n < 1024 ? `${n} B` : n < 1024 * 1024 ? `${formatNumber(n / 1024, 1)} kB` : `${formatNumber(n / 1024 / 1024, 1)} MB`);

function Headers({ message }: { message: MailMessage }) {
  const rows: [string, string][] = [
    ['From', message.from],
    ['To', message.to],
    ['Envelope', `${message.envelopeFrom || '(none)'} → ${message.envelopeTo.join(', ')}`],
    ['Received', formatDateTime(message.receivedAt)],
    ['Size', bytes(message.size)],
    ['Message-ID', message.messageId ?? '—'],
    ['Attachments', message.attachments.length ? message.attachments.map((a) => `${a.filename ?? '(no name)'} (${a.contentType}, ${bytes(a.size)})`).join('; ') : 'none'],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="font-bold text-basin-700">{k}</dt>
          <dd className="break-all text-basin-900">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/**
 * One received message. The HTML part is shown in a frame with every sandbox restriction (no scripts, no
 * forms, no navigation of this page, its own opaque origin): received mail may carry anything.
 */
export function MailMessageView({ id }: { id: number }) {
  const message = useMailMessage(id);
  return (
    <div className="space-y-5">
      <Headers message={message} />
      <section aria-labelledby={`html-${id}`}>
        <h3 id={`html-${id}`} className="text-sm font-bold text-basin-900">
          HTML part
        </h3>
        {message.html ? (
          <iframe key={message.id} title={`HTML part of “${message.subject}”`} sandbox="" srcDoc={message.html} className="mt-2 h-[36rem] w-full rounded-md border border-basin-200 bg-white" />
        ) : (
          <p className="mt-1 text-sm text-basin-600">This message has no HTML part.</p>
        )}
      </section>
      <section aria-labelledby={`text-${id}`}>
        <h3 id={`text-${id}`} className="text-sm font-bold text-basin-900">
          Text part
        </h3>
        {message.text ? (
          <pre className="mt-2 max-h-[36rem] overflow-auto rounded-md border border-basin-200 bg-basin-50 p-4 font-mono text-xs leading-relaxed whitespace-pre-wrap text-basin-900">{message.text}</pre>
        ) : (
          <p className="mt-1 text-sm text-basin-600">This message has no text part.</p>
        )}
      </section>
    </div>
  );
}
