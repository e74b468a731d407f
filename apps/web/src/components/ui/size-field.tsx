// A length typed as the shop writes it ('3/16', '1-1/4 in', '4 mm'), read with parseLength on every
// keystroke: the value as read shows beneath it, or the reason it does not read.
import { formatLengthBoth, type LengthBounds } from '@beadroll/rules';
import type { KeyboardEvent, ReactNode } from 'react';
import { readLength } from '@/lib/lengths';
import { TextField } from './field';

interface SizeFieldProps {
  label: ReactNode;
  value: string;
  onChange: (text: string) => void;
  /** A message from elsewhere (the server, a rule); the field's own reading comes first. */
  error?: string;
  positive?: boolean;
  /** The plausible sizes of what is measured; outside them the field says so (as the API would). */
  bounds?: LengthBounds;
  placeholder?: string;
  hint?: string;
  /** Enter in the field: e.g. add the next discontinuity. */
  onEnter?: () => void;
  autoFocus?: boolean;
  wrapperClassName?: string;
}

export function SizeField({ label, value, onChange, error, positive, bounds, placeholder = '3/16, 1-1/4 in or 4 mm', hint, onEnter, autoFocus, wrapperClassName }: SizeFieldProps) {
  const read = readLength(value, { positive, ...(bounds ? { bounds } : {}) });
  const own = read && !read.ok ? read.error : undefined;
  const reads = read?.ok ? `Reads as ${formatLengthBoth(read.length)}` : undefined;
  return (
    <TextField
      label={label}
      value={value}
      autoComplete="off"
      spellCheck={false}
      inputMode="text"
      placeholder={placeholder}
      autoFocus={autoFocus}
      wrapperClassName={wrapperClassName}
      onChange={(e) => onChange(e.target.value)}
      onKeyDown={(e: KeyboardEvent<HTMLInputElement>) => {
        if (e.key !== 'Enter') return;
        e.preventDefault();
        onEnter?.();
      }}
      error={own ?? error}
      hint={reads ?? hint}
    />
  );
}
