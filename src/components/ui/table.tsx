import { useMemo, useState, type ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export type SortDirection = 'ascending' | 'descending';
export type SortValue = string | number | boolean | null | undefined;

export interface Column<T> {
  id: string;
  header: string;
  cell: (row: T) => ReactNode;
  /** Makes the column sortable; null and undefined sort last in either direction. */
  sortValue?: (row: T) => SortValue;
  align?: 'left' | 'right';
  className?: string;
  /** Lets a long header break onto two lines (a wide table with many figures). */
  wrapHeader?: boolean;
}

export interface TableProps<T> {
  /** Names the table for screen readers; shown above it unless hideCaption. */
  caption: string;
  hideCaption?: boolean;
  columns: readonly Column<T>[];
  rows: readonly T[];
  rowKey: (row: T) => string | number;
  initialSort?: { id: string; direction: SortDirection };
  /** Shown in place of the body when there are no rows. */
  empty?: ReactNode;
  /**
   * Long lists: show this many rows (after sorting, so a sort looks at every row) and a button that
   * shows more.
   */
  pageSize?: number;
  /** Narrower cell padding, for tables with many columns. */
  dense?: boolean;
}

function compare(a: SortValue, b: SortValue): number {
  if (typeof a === 'string' && typeof b === 'string') return a.localeCompare(b, undefined, { numeric: true, sensitivity: 'base' });
  return Number(a) - Number(b);
}

export function sortRows<T>(rows: readonly T[], value: (row: T) => SortValue, direction: SortDirection): T[] {
  const sign = direction === 'ascending' ? 1 : -1;
  // Stable: equal keys keep their order, so a second click flips only what differs.
  return rows
    .map((row, index) => ({ row, index, key: value(row) }))
    .sort((x, y) => {
      const xMissing = x.key === null || x.key === undefined;
      const yMissing = y.key === null || y.key === undefined;
      if (xMissing || yMissing) return xMissing === yMissing ? x.index - y.index : xMissing ? 1 : -1;
      return sign * compare(x.key, y.key) || x.index - y.index;
    })
    .map((x) => x.row);
}

function SortIcon({ direction }: { direction: SortDirection | null }) {
  return (
    <svg viewBox="0 0 12 16" className="size-3 shrink-0" aria-hidden="true">
      <path d="M6 2 10 6.5H2z" className={direction === 'ascending' ? 'fill-tide-700' : 'fill-basin-300'} />
      <path d="M6 14 2 9.5h8z" className={direction === 'descending' ? 'fill-tide-700' : 'fill-basin-300'} />
    </svg>
  );
}

export function Table<T>({ caption, hideCaption = false, columns, rows, rowKey, initialSort, empty, pageSize, dense = false }: TableProps<T>) {
  const [sort, setSort] = useState(initialSort ?? null);
  const [limit, setLimit] = useState(pageSize ?? Infinity);
  const sorted = useMemo(() => {
    const column = sort && columns.find((c) => c.id === sort.id);
    return column?.sortValue && sort ? sortRows(rows, column.sortValue, sort.direction) : rows;
  }, [rows, columns, sort]);

  const toggle = (id: string) =>
    setSort((current) =>
      current?.id === id ? { id, direction: current.direction === 'ascending' ? 'descending' : 'ascending' } : { id, direction: 'ascending' },
    );

  const visible = sorted.length > limit ? sorted.slice(0, limit) : sorted;
  const hidden = sorted.length - visible.length;

  return (
    <div className="overflow-x-auto rounded-lg border border-basin-200 bg-white">
      <table className="w-full border-collapse text-left text-sm">
        <caption className={cn('px-4 pt-3 pb-2 text-left text-sm font-bold text-basin-800', hideCaption && 'sr-only')}>{caption}</caption>
        <thead className="border-b border-basin-200 bg-basin-50 text-basin-700">
          <tr>
            {columns.map((c) => {
              const direction = sort?.id === c.id ? sort.direction : null;
              return (
                <th
                  key={c.id}
                  scope="col"
                  aria-sort={c.sortValue ? (direction ?? 'none') : undefined}
                  className={cn(dense ? 'px-3 py-2 font-bold' : 'px-4 py-2 font-bold', c.wrapHeader ? 'min-w-20 align-bottom' : 'whitespace-nowrap', c.align === 'right' && 'text-right')}
                >
                  {c.sortValue ? (
                    <button
                      type="button"
                      onClick={() => toggle(c.id)}
                      // A block-level flex box in every sortable header, so left and right headers sit on one line.
                      className={cn('-mx-1 flex w-fit items-center gap-1.5 rounded px-1 hover:text-tide-700', c.align === 'right' && 'ml-auto flex-row-reverse')}
                    >
                      {c.header}
                      <SortIcon direction={direction} />
                    </button>
                  ) : (
                    c.header
                  )}
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {sorted.length === 0 ? (
            <tr>
              <td colSpan={columns.length} className="px-4 py-6">
                {empty ?? <p className="text-center text-basin-600">Nothing to show.</p>}
              </td>
            </tr>
          ) : (
            visible.map((row) => (
              <tr key={rowKey(row)} className="border-b border-basin-100 last:border-b-0 hover:bg-basin-50/60">
                {columns.map((c) => (
                  <td key={c.id} className={cn(dense ? 'px-3 py-2 align-middle' : 'px-4 py-2 align-middle', c.align === 'right' && 'text-right tabular-nums', c.className)}>
                    {c.cell(row)}
                  </td>
                ))}
              </tr>
            ))
          )}
        </tbody>
      </table>
      {hidden > 0 && (
        <div className="flex items-center gap-3 border-t border-basin-200 px-4 py-2 text-sm text-basin-700">
          <span>
            {visible.length} of {sorted.length} rows shown.
          </span>
          <button
            type="button"
            onClick={() => setLimit((n) => n + (pageSize ?? hidden) * 4)}
            className="rounded font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800"
          >
            Show {Math.min(hidden, (pageSize ?? hidden) * 4)} more
          </button>
          <button type="button" onClick={() => setLimit(Infinity)} className="rounded font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800">
            Show all
          </button>
        </div>
      )}
    </div>
  );
}
