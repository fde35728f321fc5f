import { useId, type InputHTMLAttributes, type ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

export interface InputProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> {
  label: string;
  /** Keeps the label for assistive technology but hides it on screen (inputs inside a table row). */
  hideLabel?: boolean;
  hint?: ReactNode;
  error?: string;
  /** A unit shown inside the field's right end, such as m³ or %; the label should not repeat it. */
  unit?: string;
}

export const fieldClass =
  'block w-full rounded-md bg-white px-3 text-sm text-basin-900 placeholder:text-basin-500 disabled:bg-basin-100 disabled:text-basin-600';

export function Input({ label, hideLabel = false, hint, error, unit, className, ...rest }: InputProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className={cn('mb-1 block text-sm font-bold text-basin-800', hideLabel && 'sr-only')}>
        {label}
      </label>
      {unit ? (
        <div
          className={cn(
            'flex items-stretch overflow-hidden rounded-md border bg-white focus-within:outline-2 focus-within:outline-offset-2 focus-within:outline-tide-600',
            error ? 'border-ember-600' : 'border-basin-400',
          )}
        >
          <input
            id={id}
            aria-invalid={error ? true : undefined}
            aria-describedby={describedBy}
            className={cn(fieldClass, 'min-w-0 rounded-none border-0 py-2 focus-visible:outline-none')}
            {...rest}
          />
          <span className="flex shrink-0 items-center border-l border-basin-200 bg-basin-50 px-3 text-sm whitespace-nowrap text-basin-700">
            {unit}
          </span>
        </div>
      ) : (
        <input
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={cn(fieldClass, 'border py-2', error ? 'border-ember-600' : 'border-basin-400')}
          {...rest}
        />
      )}
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
