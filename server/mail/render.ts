// The mail Osmia sends, as one small document model written out twice: a plain-text part and an HTML part
// (multipart/alternative, RFC 2046 §5.1.4: the same content, the reader's program picks one). Every piece
// of text is escaped in the HTML part: work-order descriptions, file names and asset codes come from
// imported files and may hold markup.

export type Block =
  | { type: 'heading'; text: string }
  | { type: 'paragraph'; text: string; muted?: boolean }
  /** A table of figures: a label column, then one column per heading. */
  | { type: 'figures'; columns: readonly string[]; rows: readonly { label: string; values: readonly string[] }[] }
  | { type: 'list'; items: readonly string[] }
  | { type: 'link'; text: string; href: string }
  /** Safety cautions (shared/cautions.ts), set apart so they are read. */
  | { type: 'cautions'; title: string; items: readonly string[] };

export interface MailDocument {
  /** The first heading, also the HTML title. */
  title: string;
  blocks: readonly Block[];
  /** Small print at the end: why the reader gets this mail, and how to stop it. */
  footer: readonly string[];
}

/** Text for HTML element content and attribute values (the five characters of the HTML standard's escaping). */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** A link target for the HTML part: only http(s) addresses (a `javascript:` one would run in some readers). */
function safeHref(href: string): string | null {
  try {
    const u = new URL(href);
    return u.protocol === 'http:' || u.protocol === 'https:' ? u.toString() : null;
  } catch {
    return null;
  }
}

/** Words of a line, a unit kept with its number ("10 %", "8.0 h", "800 m³" never break apart). */
function words(text: string): string[] {
  const out: string[] = [];
  for (const w of text.split(/[ \t\n]+/).filter(Boolean)) {
    if (out.length > 0 && /^(%|h|m³)(\W|$)/.test(w) && /\d$/.test(out[out.length - 1])) out[out.length - 1] += ` ${w}`;
    else out.push(w);
  }
  return out;
}

function wrap(text: string, width = 78, indent = ''): string {
  const ws = words(text);
  const lines: string[] = [];
  let line = indent;
  for (const w of ws) {
    if (line.trim() !== '' && line.length + 1 + w.length > width) {
      lines.push(line);
      line = indent + w;
    } else line = line.trim() === '' ? indent + w : `${line} ${w}`;
  }
  if (line.trim() !== '') lines.push(line);
  return lines.join('\n');
}

export function renderText(doc: MailDocument): string {
  const out: string[] = [doc.title, '='.repeat(Math.min(78, doc.title.length)), ''];
  for (const b of doc.blocks) {
    switch (b.type) {
      case 'heading':
        out.push(b.text, '-'.repeat(Math.min(78, b.text.length)));
        break;
      case 'paragraph':
        out.push(wrap(b.text), '');
        break;
      case 'figures': {
        const widths = [Math.max(0, ...b.rows.map((r) => r.label.length)), ...b.columns.map((c, i) => Math.max(c.length, ...b.rows.map((r) => (r.values[i] ?? '').length)))];
        out.push(['', ...b.columns].map((c, i) => (i === 0 ? c.padEnd(widths[0]) : c.padStart(widths[i]))).join('   ').trimEnd());
        for (const r of b.rows) out.push([r.label.padEnd(widths[0]), ...r.values.map((v, i) => v.padStart(widths[i + 1]))].join('   ').trimEnd());
        out.push('');
        break;
      }
      case 'list':
        for (const item of b.items) out.push(wrap(item, 78, '  ').replace(/^ {2}/, '- '));
        out.push('');
        break;
      case 'link':
        out.push(`${b.text}: ${b.href}`, '');
        break;
      case 'cautions':
        out.push(`${b.title}:`);
        for (const item of b.items) out.push(wrap(item, 78, '  ').replace(/^ {2}/, '! '));
        out.push('');
        break;
    }
  }
  out.push('--', ...doc.footer.map((f) => wrap(f)));
  return out.join('\n').replace(/\n{3,}/g, '\n\n') + '\n';
}

const style = {
  body: 'margin:0;padding:24px;background:#f4f7f8;font-family:Helvetica,Arial,sans-serif;font-size:14px;line-height:1.5;color:#1b2b33',
  card: 'max-width:680px;margin:0 auto;background:#ffffff;border:1px solid #d5e0e4;border-radius:8px;padding:24px',
  h1: 'margin:0 0 16px;font-size:20px;color:#0d3b4c',
  h2: 'margin:24px 0 8px;font-size:16px;color:#0d3b4c',
  muted: 'color:#52656e',
  table: 'border-collapse:collapse;width:100%;margin:4px 0 12px',
  th: 'text-align:right;padding:4px 8px;border-bottom:1px solid #d5e0e4;font-size:12px;color:#52656e',
  tdLabel: 'text-align:left;padding:4px 8px;border-bottom:1px solid #eef3f5',
  td: 'text-align:right;padding:4px 8px;border-bottom:1px solid #eef3f5;font-variant-numeric:tabular-nums',
  cautions: 'margin:12px 0;padding:12px 16px;background:#fff8e6;border-left:4px solid #c98a00',
  link: 'color:#0b6b8a;font-weight:bold',
  footer: 'margin-top:24px;font-size:12px;color:#52656e',
};

export function renderHtml(doc: MailDocument): string {
  // Escaped, and a number kept on one line with its unit.
  const e = (text: string) => escapeHtml(text).replace(/(\d) (%|h\b|m³)/g, '$1&nbsp;$2');
  const parts: string[] = [];
  for (const b of doc.blocks) {
    switch (b.type) {
      case 'heading':
        parts.push(`<h2 style="${style.h2}">${e(b.text)}</h2>`);
        break;
      case 'paragraph':
        parts.push(`<p style="${b.muted ? style.muted : ''}">${e(b.text)}</p>`);
        break;
      case 'figures':
        parts.push(
          `<table style="${style.table}"><thead><tr><th style="${style.th};text-align:left"></th>${b.columns.map((c) => `<th style="${style.th}">${e(c)}</th>`).join('')}</tr></thead><tbody>` +
            b.rows.map((r) => `<tr><td style="${style.tdLabel}">${e(r.label)}</td>${r.values.map((v) => `<td style="${style.td}">${e(v)}</td>`).join('')}</tr>`).join('') +
            '</tbody></table>',
        );
        break;
      case 'list':
        parts.push(`<ul>${b.items.map((i) => `<li>${e(i)}</li>`).join('')}</ul>`);
        break;
      case 'link': {
        const href = safeHref(b.href);
        parts.push(href ? `<p><a style="${style.link}" href="${escapeHtml(href)}">${e(b.text)}</a></p>` : `<p>${e(b.text)}: ${e(b.href)}</p>`);
        break;
      }
      case 'cautions':
        parts.push(`<div style="${style.cautions}"><strong>${e(b.title)}</strong><ul>${b.items.map((i) => `<li>${e(i)}</li>`).join('')}</ul></div>`);
        break;
    }
  }
  return (
    `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${e(doc.title)}</title></head>` +
    `<body style="${style.body}"><div style="${style.card}"><h1 style="${style.h1}">${e(doc.title)}</h1>${parts.join('\n')}` +
    `<div style="${style.footer}">${doc.footer.map((f) => `<p>${e(f)}</p>`).join('')}</div></div></body></html>\n`
  );
}
