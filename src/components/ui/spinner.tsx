import { cn } from '../../lib/cn.ts';

export interface SpinnerProps {
  size?: 'sm' | 'md' | 'lg';
  /** Text for screen readers; null when the spinner sits inside something that already says it (a busy button). */
  label?: string | null;
  className?: string;
}

const sizes = { sm: 'size-4', md: 'size-6', lg: 'size-10' } as const;

export function Spinner({ size = 'md', label = 'Loading…', className }: SpinnerProps) {
  const svg = (
    <svg className={cn('animate-spin', sizes[size], className)} viewBox="0 0 24 24" fill="none" aria-hidden="true">
      <circle cx="12" cy="12" r="9" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
      <path d="M21 12a9 9 0 0 0-9-9" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
    </svg>
  );
  if (label === null) return svg;
  return (
    <span role="status" className="inline-flex items-center gap-2 text-basin-600">
      {svg}
      <span className="sr-only">{label}</span>
    </span>
  );
}
