import { useId, type ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export interface CardProps {
  /** Heading of the card (an h2); the card is a labelled region when it has one. */
  title?: string;
  description?: ReactNode;
  actions?: ReactNode;
  className?: string;
  children: ReactNode;
}

export function Card({ title, description, actions, className, children }: CardProps) {
  const headingId = useId();
  return (
    <section aria-labelledby={title ? headingId : undefined} className={cn('rounded-lg border border-basin-200 bg-white p-5 shadow-sm', className)}>
      {(title || actions) && (
        <div className="mb-4 flex flex-wrap items-start justify-between gap-3">
          <div>
            {title && (
              <h2 id={headingId} className="text-base font-bold text-basin-900">
                {title}
              </h2>
            )}
            {description && <div className="mt-1 text-sm text-basin-600">{description}</div>}
          </div>
          {actions && <div className="flex items-center gap-2">{actions}</div>}
        </div>
      )}
      {children}
    </section>
  );
}
