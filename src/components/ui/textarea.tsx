import { useId, type ReactNode, type TextareaHTMLAttributes } from 'react';
import { cn } from '../../lib/cn.ts';
import { fieldClass } from './input.tsx';

export interface TextAreaProps extends Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> {
  label: string;
  hint?: ReactNode;
  error?: string;
}

export function TextArea({ label, hint, error, className, rows = 4, ...rest }: TextAreaProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-bold text-basin-800">
        {label}
      </label>
      <textarea
        id={id}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cn(fieldClass, 'border py-2', error ? 'border-ember-600' : 'border-basin-400')}
        {...rest}
      />
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
