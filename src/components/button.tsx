import type { ButtonHTMLAttributes } from 'react';

const VARIANTS = {
  primary: 'bg-walnut-800 text-parchment-50 hover:bg-walnut-700 shadow-sm',
  accent: 'bg-amber-400 text-walnut-950 hover:bg-amber-300 shadow-sm',
  secondary: 'bg-white text-walnut-800 border border-walnut-200 hover:bg-parchment-100',
  danger: 'bg-brick-600 text-white hover:bg-brick-700 shadow-sm',
  ghost: 'text-walnut-700 hover:bg-walnut-50',
} as const;

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: keyof typeof VARIANTS;
  size?: 'sm' | 'md';
  busy?: boolean;
}

export function Button({ variant = 'primary', size = 'md', busy, className = '', children, disabled, ...rest }: ButtonProps) {
  const sizing = size === 'sm' ? 'px-2.5 py-1 text-sm' : 'px-4 py-2 text-sm';
  return (
    <button
      type="button"
      {...rest}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-55 ${sizing} ${VARIANTS[variant]} ${className}`}
    >
      {busy && <span className="h-3.5 w-3.5 animate-spin rounded-full border-2 border-current border-r-transparent" aria-hidden />}
      {children}
    </button>
  );
}
