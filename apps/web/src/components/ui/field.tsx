// Labelled form controls with their error right beneath them, wired for screen readers
// (aria-invalid, aria-describedby) so an error is announced with the field it belongs to.
import { useId, type InputHTMLAttributes, type ReactNode, type Ref, type SelectHTMLAttributes } from 'react';
import { AlertIcon } from './icons';

const controlBase =
  'block w-full rounded-md border bg-white px-3 text-base text-stone-900 shadow-sm placeholder:text-stone-400 ' +
  'min-h-11 sm:min-h-9 sm:text-sm focus:border-accent-500 focus:outline-2 focus:outline-offset-0 focus:outline-accent-500/30 ' +
  'disabled:bg-stone-100 disabled:text-stone-500';

export function controlClasses(invalid: boolean): string {
  return `${controlBase} ${invalid ? 'border-red-500' : 'border-stone-300'}`;
}

export function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1 text-sm text-red-700">
      <AlertIcon className="mt-0.5 size-4 shrink-0" />
      <span>{message}</span>
    </p>
  );
}

interface FieldShellProps {
  id: string;
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
  className?: string;
}

function FieldShell({ id, label, error, hint, children, className = '' }: FieldShellProps) {
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-semibold text-stone-800">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-stone-500">
          {hint}
        </p>
      )}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

function describedBy(id: string, error?: string, hint?: ReactNode): string | undefined {
  if (error) return `${id}-error`;
  if (hint) return `${id}-hint`;
  return undefined;
}

interface TextFieldProps extends InputHTMLAttributes<HTMLInputElement> {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  ref?: Ref<HTMLInputElement>;
  wrapperClassName?: string;
}

export function TextField({ label, error, hint, id, wrapperClassName, className = '', ref, ...props }: TextFieldProps) {
  const autoId = useId();
  const fieldId = id ?? autoId;
  return (
    <FieldShell id={fieldId} label={label} error={error} hint={hint} className={wrapperClassName}>
      <input
        id={fieldId}
        ref={ref}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(fieldId, error, hint)}
        className={`${controlClasses(Boolean(error))} ${className}`}
        {...props}
      />
    </FieldShell>
  );
}

interface SelectFieldProps extends SelectHTMLAttributes<HTMLSelectElement> {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  ref?: Ref<HTMLSelectElement>;
  wrapperClassName?: string;
  children: ReactNode;
}

export function SelectField({ label, error, hint, id, wrapperClassName, className = '', ref, children, ...props }: SelectFieldProps) {
  const autoId = useId();
  const fieldId = id ?? autoId;
  return (
    <FieldShell id={fieldId} label={label} error={error} hint={hint} className={wrapperClassName}>
      <select
        id={fieldId}
        ref={ref}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(fieldId, error, hint)}
        className={`${controlClasses(Boolean(error))} pr-8 ${className}`}
        {...props}
      >
        {children}
      </select>
    </FieldShell>
  );
}

/** A group of checkboxes with one legend and one error (e.g. a foreman's shops). */
export function CheckboxGroup({
  legend,
  error,
  hint,
  children,
}: {
  legend: ReactNode;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
}) {
  const id = useId();
  return (
    <fieldset aria-describedby={error ? `${id}-error` : undefined} aria-invalid={error ? true : undefined}>
      <legend className="mb-1 text-sm font-semibold text-stone-800">{legend}</legend>
      {hint && <p className="mb-1 text-xs text-stone-500">{hint}</p>}
      <div className="flex flex-col gap-1">{children}</div>
      <FieldError id={`${id}-error`} message={error} />
    </fieldset>
  );
}

interface CheckboxProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'type'> {
  label: ReactNode;
  ref?: Ref<HTMLInputElement>;
}

export function Checkbox({ label, ref, className = '', ...props }: CheckboxProps) {
  return (
    <label className={`flex min-h-11 items-center gap-2 text-base sm:min-h-8 sm:text-sm ${className}`}>
      <input type="checkbox" ref={ref} className="size-5 rounded border-stone-400 accent-accent-600 sm:size-4" {...props} />
      <span>{label}</span>
    </label>
  );
}

/** The form-level message (a conflict, a network failure) shown above the form's buttons. */
export function FormError({ message }: { message?: string }) {
  if (!message) return null;
  return (
    <div role="alert" className="flex items-start gap-2 rounded-md border border-red-200 bg-red-50 px-3 py-2 text-sm text-red-800">
      <AlertIcon className="mt-0.5 size-4 shrink-0" />
      <span>{message}</span>
    </div>
  );
}
