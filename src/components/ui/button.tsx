import type { ButtonHTMLAttributes } from 'react';
import { cn } from '../../lib/cn.ts';
import { Spinner } from './spinner.tsx';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'ghost';
export type ButtonSize = 'sm' | 'md';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-tide-700 text-white hover:bg-tide-800 active:bg-tide-900 disabled:bg-basin-300 disabled:text-basin-700',
  secondary:
    'border border-basin-400 bg-white text-basin-900 hover:bg-basin-100 active:bg-basin-200 disabled:text-basin-500 disabled:hover:bg-white',
  danger: 'bg-ember-700 text-white hover:bg-ember-800 disabled:bg-basin-300 disabled:text-basin-700',
  ghost: 'text-tide-700 hover:bg-tide-50 active:bg-tide-100 disabled:text-basin-500 disabled:hover:bg-transparent',
};

const sizes: Record<ButtonSize, string> = {
  sm: 'h-8 px-3 text-sm gap-1.5',
  md: 'h-10 px-4 text-sm gap-2',
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner and blocks clicks while an action runs; the label stays for screen readers. */
  loading?: boolean;
}

export function Button({ variant = 'primary', size = 'md', loading = false, disabled, type = 'button', className, children, ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      className={cn(
        'inline-flex shrink-0 items-center justify-center rounded-md font-bold whitespace-nowrap transition-colors disabled:cursor-not-allowed',
        variants[variant],
        sizes[size],
        className,
      )}
      {...rest}
    >
      {loading && <Spinner size="sm" label={null} />}
      {children}
    </button>
  );
}
