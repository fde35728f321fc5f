import type { ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export type AlertTone = 'info' | 'success' | 'warning' | 'error';

const tones: Record<AlertTone, string> = {
  info: 'border-tide-200 bg-tide-50 text-tide-900',
  success: 'border-kelp-200 bg-kelp-50 text-kelp-800',
  warning: 'border-sand-200 bg-sand-50 text-sand-800',
  error: 'border-ember-200 bg-ember-50 text-ember-800',
};

const icons: Record<AlertTone, string> = {
  info: 'M12 11v5m0-8h.01',
  success: 'm8 12.5 2.5 2.5L16 9.5',
  warning: 'M12 8v4.5m0 3h.01',
  error: 'm9 9 6 6m0-6-6 6',
};

export interface AlertProps {
  tone?: AlertTone;
  title?: string;
  children?: ReactNode;
  className?: string;
}

/** A message in the page. Errors and warnings interrupt a screen reader (role alert); the others wait (status). */
export function Alert({ tone = 'info', title, children, className }: AlertProps) {
  return (
    <div
      role={tone === 'error' || tone === 'warning' ? 'alert' : 'status'}
      className={cn('flex gap-3 rounded-md border px-4 py-3 text-sm', tones[tone], className)}
    >
      <svg viewBox="0 0 24 24" className="mt-0.5 size-5 shrink-0" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" aria-hidden="true">
        <circle cx="12" cy="12" r="9.5" />
        <path d={icons[tone]} />
      </svg>
      <div className="min-w-0">
        {title && <p className="font-bold">{title}</p>}
        {children && <div className={cn(title && 'mt-0.5')}>{children}</div>}
      </div>
    </div>
  );
}
