import { Button } from './button.tsx';

export interface PagerProps {
  /** What is paged, for the label: "runs", "messages". */
  noun: string;
  offset: number;
  limit: number;
  total: number;
  onOffset: (offset: number) => void;
  pending?: boolean;
}

/** "21–40 of 55" with buttons to the newer and older pages of a list kept newest first. */
export function Pager({ noun, offset, limit, total, onOffset, pending }: PagerProps) {
  if (total <= limit && offset === 0) return null;
  const last = Math.min(total, offset + limit);
  return (
    <nav aria-label={`Pages of ${noun}`} className="flex items-center justify-between gap-3 text-sm text-basin-700">
      <p className="tabular-nums">
        {total === 0 ? `No ${noun}` : `${offset + 1}–${last} of ${total} ${noun}`}
      </p>
      <div className="flex gap-2">
        <Button variant="secondary" size="sm" disabled={offset === 0 || pending} onClick={() => onOffset(Math.max(0, offset - limit))}>
          Newer
        </Button>
        <Button variant="secondary" size="sm" disabled={last >= total || pending} onClick={() => onOffset(offset + limit)}>
          Older
        </Button>
      </div>
    </nav>
  );
}
