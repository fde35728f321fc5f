import { Fragment, type ReactNode } from 'react';
import { formatDateTime } from '../../lib/format.ts';

// A note from the server is a sentence that may name an instant (ISO 8601, as the API writes times)
// or a command in backticks, as the command line prints it. On a page the instant reads as a local
// date and time like every other date here, and the command as inline code, never as raw text.
const token = /`([^`]+)`|(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2}))/g;

/** One note of a KPI answer, with its instants as dates and its commands as code. */
export function NoteText({ text }: { text: string }) {
  const parts: ReactNode[] = [];
  let last = 0;
  for (const m of text.matchAll(token)) {
    const at = m.index;
    if (at > last) parts.push(text.slice(last, at));
    if (m[1] !== undefined) {
      parts.push(
        <code key={at} className="rounded bg-basin-100 px-1 font-mono text-[0.9em] text-basin-900">
          {m[1]}
        </code>,
      );
    } else {
      parts.push(
        <time key={at} dateTime={m[2]}>
          {formatDateTime(m[2])}
        </time>,
      );
    }
    last = at + m[0].length;
  }
  if (last < text.length) parts.push(text.slice(last));
  return <Fragment>{parts}</Fragment>;
}
