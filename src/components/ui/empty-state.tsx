import type { ReactNode } from 'react';

export interface EmptyStateProps {
  title: string;
  description?: ReactNode;
  action?: ReactNode;
}

export function EmptyState({ title, description, action }: EmptyStateProps) {
  return (
    <div className="flex flex-col items-center gap-2 rounded-lg border border-dashed border-basin-300 bg-white px-6 py-10 text-center">
      <svg viewBox="0 0 32 32" className="size-8 text-basin-400" fill="none" stroke="currentColor" strokeWidth="2" aria-hidden="true">
        <path d="M6 20c3-2.5 6-2.5 10 0s7 2.5 10 0" strokeLinecap="round" />
        <path d="M6 25c3-2.5 6-2.5 10 0s7 2.5 10 0" strokeLinecap="round" />
      </svg>
      <p className="font-bold text-basin-800">{title}</p>
      {description && <div className="max-w-md text-sm text-basin-600">{description}</div>}
      {action && <div className="mt-2">{action}</div>}
    </div>
  );
}
