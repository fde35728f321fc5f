import { useState, useTransition } from 'react';
import type { MailMessageSummary } from '#shared/schemas/mail.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorBoundary } from '../../../components/ui/error-boundary.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { mailPageSize, useMail } from '../api/get-mail.ts';
import { MailMessageView } from './mail-message-view.tsx';

/** Where mail goes, and what waits in the outbox. */
function Delivery({ relay, outbox }: Pick<ReturnType<typeof useMail>, 'relay' | 'outbox'>) {
  return (
    <div className="space-y-3">
      <p className="text-sm text-basin-700">
        {relay
          ? relay.host === '127.0.0.1' || relay.host === 'localhost'
            ? `Mail goes to the development mail server on ${relay.host}:${relay.port}: it keeps every message here and delivers none. Set SMTP_URL to send through a real relay.`
            : `Mail goes out through ${relay.host}:${relay.port}${relay.secure ? ' (TLS)' : ''}. The messages below are those a development mail server received.`
          : 'No SMTP server is configured for this server (SMTP_URL). The nightly run uses its own setting.'}
      </p>
      {outbox.waiting > 0 ? (
        <Alert tone="warning" title={`${outbox.waiting} ${outbox.waiting === 1 ? 'message waits' : 'messages wait'} in the outbox`}>
          Waiting since {formatDateTime(outbox.oldestWaitingAt)}; the next nightly run tries again.{outbox.lastError ? ` Last error: ${outbox.lastError}` : ''}
        </Alert>
      ) : (
        <p className="text-sm text-basin-600">The outbox is empty: {outbox.sent} {outbox.sent === 1 ? 'message' : 'messages'} sent so far.</p>
      )}
    </div>
  );
}

/** What the development mail server received, newest first; "Open" shows a message with both parts. */
export function MailPanel() {
  const [offset, setOffset] = useState(0);
  const [pending, startTransition] = useTransition();
  const page = useMail(offset);
  const [openId, setOpenId] = useState<number | null>(null);
  const columns: Column<MailMessageSummary>[] = [
    { id: 'received', header: 'Received', cell: (m) => <span className="whitespace-nowrap">{formatDateTime(m.receivedAt)}</span> },
    { id: 'to', header: 'To', cell: (m) => <span className="break-all">{m.to}</span> },
    { id: 'subject', header: 'Subject', cell: (m) => <span className="text-basin-900">{m.subject || '(no subject)'}</span> },
    { id: 'attachments', header: 'Attachments', align: 'right', cell: (m) => (m.attachments.length ? m.attachments.length : '—') },
    {
      id: 'open',
      header: 'Message',
      cell: (m) => (
        <Button variant="ghost" size="sm" aria-expanded={openId === m.id} aria-label={`Open the message “${m.subject}” to ${m.to}`} onClick={() => setOpenId(openId === m.id ? null : m.id)}>
          {openId === m.id ? 'Hide' : 'Open'}
        </Button>
      ),
    },
  ];
  const open = page.messages.find((m) => m.id === openId);
  return (
    <div className="space-y-4">
      <Delivery relay={page.relay} outbox={page.outbox} />
      <Table
        caption={`Received messages${page.total ? `: ${page.total}` : ''}`}
        columns={columns}
        rows={page.messages}
        rowKey={(m) => m.id}
        dense
        empty={<p className="text-center text-basin-600">No message received yet. The nightly run sends the digest and alerts here.</p>}
      />
      <Pager noun="messages" offset={offset} limit={mailPageSize} total={page.total} pending={pending} onOffset={(o) => startTransition(() => setOffset(o))} />
      {open && (
        <Card
          title={open.subject || '(no subject)'}
          description={`To ${open.to}`}
          actions={
            <Button variant="secondary" size="sm" onClick={() => setOpenId(null)}>
              Close
            </Button>
          }
        >
          <ErrorBoundary title="The message">
            <MailMessageView key={open.id} id={open.id} />
          </ErrorBoundary>
        </Card>
      )}
    </div>
  );
}
