import { useSyncExternalStore } from 'react';
import { cn } from '../../lib/cn.ts';

export type ToastTone = 'success' | 'error';

export interface ToastItem {
  id: number;
  tone: ToastTone;
  title: string;
  message?: string;
}

// A tiny store outside React, so the query client's mutation cache (created before any component)
// can raise a toast for every failed mutation.
let items: ToastItem[] = [];
let nextId = 1;
const listeners = new Set<() => void>();
const maxVisible = 4;
const successMs = 5000;

function emit() {
  for (const listener of listeners) listener();
}

export function dismissToast(id: number) {
  items = items.filter((t) => t.id !== id);
  emit();
}

/**
 * Shows a toast. A success fades after a few seconds; an error stays until dismissed, so nobody
 * misses why a change did not happen.
 */
export function showToast(toast: Omit<ToastItem, 'id'>): number {
  const id = nextId++;
  items = [...items, { ...toast, id }].slice(-maxVisible);
  emit();
  if (toast.tone === 'success') setTimeout(() => dismissToast(id), successMs);
  return id;
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function Toaster() {
  const toasts = useSyncExternalStore(subscribe, () => items);
  return (
    <div aria-live="polite" className="pointer-events-none fixed right-4 bottom-4 z-50 flex w-[min(24rem,calc(100vw-2rem))] flex-col gap-2">
      {toasts.map((t) => (
        <div
          key={t.id}
          role={t.tone === 'error' ? 'alert' : 'status'}
          className={cn(
            'pointer-events-auto flex items-start gap-3 rounded-lg border bg-white px-4 py-3 text-sm shadow-lg',
            t.tone === 'error' ? 'border-ember-200 border-l-4 border-l-ember-600' : 'border-kelp-200 border-l-4 border-l-kelp-600',
          )}
        >
          <div className="min-w-0 flex-1">
            <p className={cn('font-bold', t.tone === 'error' ? 'text-ember-800' : 'text-kelp-800')}>{t.title}</p>
            {t.message && <p className="mt-0.5 text-basin-800">{t.message}</p>}
          </div>
          <button
            type="button"
            onClick={() => dismissToast(t.id)}
            className="-mr-1 rounded p-1 text-basin-600 hover:bg-basin-100 hover:text-basin-900"
            aria-label="Dismiss notification"
          >
            <svg viewBox="0 0 16 16" className="size-4" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" aria-hidden="true">
              <path d="m4 4 8 8m0-8-8 8" />
            </svg>
          </button>
        </div>
      ))}
    </div>
  );
}
