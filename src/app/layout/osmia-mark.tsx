import { cn } from '../../lib/cn.ts';

/**
 * Osmia's mark: the cross-section of a spiral-wound element (leaves wound round the permeate tube)
 * on a rounded tile. Decorative: the wordmark beside it carries the name.
 */
export function OsmiaMark({ large = false }: { large?: boolean }) {
  return (
    <svg viewBox="0 0 32 32" className={cn('shrink-0', large ? 'size-10' : 'size-8')} aria-hidden="true">
      <rect width="32" height="32" rx="8" className="fill-tide-700" />
      <path
        d="M16 16a2 2 0 0 1 4 0a4 4 0 0 1-8 0a6 6 0 0 1 12 0a8 8 0 0 1-16 0"
        fill="none"
        className="stroke-tide-50"
        strokeWidth="2.2"
        strokeLinecap="round"
      />
    </svg>
  );
}

export function OsmiaWordmark({ size = 'md', className }: { size?: 'md' | 'lg'; className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-2.5', className)}>
      <OsmiaMark large={size === 'lg'} />
      <span className={cn('font-bold tracking-tight text-tide-900', size === 'lg' ? 'text-2xl' : 'text-xl')}>Osmia</span>
    </span>
  );
}
