// Buttons and button-styled links. Large enough to hit with a gloved finger on small screens, compact on desks.
import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router-dom';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'ghost';

const base =
  'inline-flex items-center justify-center gap-1.5 rounded-md font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60';

/** Both sizes stay 44 px tall on small screens (a finger on a tablet); "row" is compact on a desk, for table rows. */
const sizes = {
  normal: 'min-h-11 px-4 text-base sm:min-h-9 sm:px-3 sm:text-sm',
  row: 'min-h-11 px-3 text-base sm:min-h-7 sm:px-2 sm:text-sm',
};

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-accent-600 text-white shadow-sm hover:bg-accent-700',
  secondary: 'bg-white text-stone-800 ring-1 ring-inset ring-stone-300 shadow-sm hover:bg-stone-50',
  danger: 'bg-red-700 text-white shadow-sm hover:bg-red-800',
  ghost: 'text-accent-700 hover:bg-accent-50',
};

export function buttonClasses(variant: ButtonVariant = 'secondary', extra = '', size: keyof typeof sizes = 'normal'): string {
  return `${base} ${sizes[size]} ${variants[variant]} ${extra}`;
}

interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  busy?: boolean;
  size?: keyof typeof sizes;
  children: ReactNode;
}

export function Button({ variant = 'secondary', size = 'normal', busy = false, className = '', disabled, children, type = 'button', ...props }: ButtonProps) {
  return (
    <button
      type={type}
      className={buttonClasses(variant, className, size)}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...props}
    >
      {busy && <Spinner className="size-4" />}
      {children}
    </button>
  );
}

export function ButtonLink({ variant = 'secondary', className = '', ...props }: LinkProps & { variant?: ButtonVariant }) {
  return <Link className={buttonClasses(variant, className)} {...props} />;
}
