import { useId, type InputHTMLAttributes, type ReactNode } from 'react';

export interface CheckboxProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'type'> {
  label: string;
  hint?: ReactNode;
}

export function Checkbox({ label, hint, className, ...rest }: CheckboxProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  return (
    <div className={className}>
      <div className="flex items-start gap-2">
        <input id={id} type="checkbox" aria-describedby={hint ? hintId : undefined} className="mt-0.5 size-4 shrink-0 rounded border-basin-400 accent-tide-700" {...rest} />
        <div>
          <label htmlFor={id} className="text-sm font-bold text-basin-800">
            {label}
          </label>
          {hint && (
            <p id={hintId} className="text-xs text-basin-600">
              {hint}
            </p>
          )}
        </div>
      </div>
    </div>
  );
}
