import type { ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export type BadgeTone = 'neutral' | 'brand' | 'ok' | 'warning' | 'fault';

const tones: Record<BadgeTone, string> = {
  neutral: 'bg-basin-100 text-basin-800',
  brand: 'bg-tide-100 text-tide-900',
  ok: 'bg-kelp-100 text-kelp-800',
  warning: 'bg-sand-100 text-sand-800',
  fault: 'bg-ember-100 text-ember-800',
};

export function Badge({ tone = 'neutral', children }: { tone?: BadgeTone; children: ReactNode }) {
  return <span className={cn('inline-flex items-center rounded-full px-2 py-0.5 text-xs font-bold', tones[tone])}>{children}</span>;
}
