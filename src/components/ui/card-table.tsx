import type { ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export interface CardTableColumn {
  header: string;
  align?: 'left' | 'right';
  /** Extra classes of the header cell, e.g. a column shown only in a wide card (`hidden @xl:table-cell`). */
  className?: string;
}

/**
 * A small table inside a dashboard card: the caption for screen readers only, a quiet header row,
 * figures in tabular numerals. The rows (`children`) are the caller's, so a card can put its own
 * badges and bars in them; the full, sortable table of a page is `Table` (table.tsx).
 */
export function CardTable({ caption, columns, children }: { caption: string; columns: readonly CardTableColumn[]; children: ReactNode }) {
  return (
    <table className="w-full text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="text-left text-xs text-basin-600">
          {columns.map((c) => (
            <th key={c.header} scope="col" className={cn(c.className, 'pb-1', c.align === 'right' && 'text-right', 'font-normal')}>
              {c.header}
            </th>
          ))}
        </tr>
      </thead>
      <tbody className="tabular-nums">{children}</tbody>
    </table>
  );
}
