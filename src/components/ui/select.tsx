import { useId, type ReactNode, type SelectHTMLAttributes } from 'react';
import { cn } from '../../lib/cn.ts';
import { fieldClass } from './input.tsx';

export interface SelectOption {
  value: string;
  label: string;
}

export interface SelectProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'id' | 'children'> {
  label: string;
  /** Keeps the label for assistive technology but hides it on screen (a select inside a table row). */
  hideLabel?: boolean;
  options: readonly SelectOption[];
  hint?: ReactNode;
  error?: string;
  /** A lower field for table rows. */
  compact?: boolean;
}

export function Select({ label, hideLabel = false, options, hint, error, compact = false, className, ...rest }: SelectProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className={cn('mb-1 block text-sm font-bold text-basin-800', hideLabel && 'sr-only')}>
        {label}
      </label>
      <div className="relative">
        <select
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={cn(
            fieldClass,
            'appearance-none border pr-9',
            compact ? 'py-1' : 'py-2',
            error ? 'border-ember-600' : 'border-basin-400',
          )}
          {...rest}
        >
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
        <svg
          viewBox="0 0 16 16"
          className="pointer-events-none absolute top-1/2 right-3 size-4 -translate-y-1/2 text-basin-600"
          fill="none"
          stroke="currentColor"
          strokeWidth="2"
          strokeLinecap="round"
          strokeLinejoin="round"
          aria-hidden="true"
        >
          <path d="m4 6 4 4 4-4" />
        </svg>
      </div>
      {hint && (
        <p id={hintId} className="mt-1 text-xs text-basin-600">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="mt-1 text-sm text-ember-700">
          {error}
        </p>
      )}
    </div>
  );
}
