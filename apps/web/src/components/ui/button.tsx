import type { ComponentProps } from 'react';
import { Spinner } from './spinner.tsx';

const variants = {
  primary:
    'bg-plumb-700 text-white hover:bg-plumb-800 active:bg-plumb-900 disabled:bg-plumb-700/60 shadow-sm',
  secondary:
    'bg-white text-plumb-800 ring-1 ring-inset ring-plumb-200 hover:bg-plumb-50 disabled:text-slate-400',
  /** Destructive actions (deactivate, retire), always behind a confirmation. */
  danger: 'bg-alarm-700 text-white hover:bg-alarm-800 disabled:bg-alarm-700/60 shadow-sm',
  /** Quiet actions inside table rows. */
  ghost: 'bg-transparent text-plumb-800 hover:bg-plumb-50 disabled:text-slate-400',
  /** For use on the deep-teal header. */
  inverse:
    'bg-transparent text-plumb-50 ring-1 ring-inset ring-plumb-600 hover:bg-plumb-800 hover:text-white',
} as const;

const sizes = {
  md: 'h-10 px-4 text-sm',
  sm: 'h-8 px-3 text-sm',
  xs: 'h-7 px-2 text-xs',
} as const;

type ButtonProps = ComponentProps<'button'> & {
  variant?: keyof typeof variants;
  size?: keyof typeof sizes;
  isLoading?: boolean;
};

export function Button({
  variant = 'primary',
  size = 'md',
  isLoading = false,
  className = '',
  children,
  disabled,
  type = 'button',
  ...props
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || isLoading}
      aria-busy={isLoading || undefined}
      className={`inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed ${variants[variant]} ${sizes[size]} ${className}`}
      {...props}
    >
      {isLoading ? <Spinner className="size-4" /> : null}
      {children}
    </button>
  );
}
