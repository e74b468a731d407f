// Form handling for the pages a person sees before signing in (sign-in, set password, forgot password).
// They have two or three fields, and their JavaScript counts against the first-paint budget, so they use
// native inputs read with FormData and the same zod schema instead of a form library.
import { useState } from 'react';
import type { z } from 'zod';
import { ApiError, errorMessage } from './api-client';
import { splitFieldErrors } from './form-errors';

export type PlainErrors<N extends string> = Partial<Record<N | 'form', string>>;

export function usePlainForm<S extends z.ZodType<Record<string, unknown>>, N extends string>(schema: S, fields: readonly N[]) {
  const [errors, setErrors] = useState<PlainErrors<N>>({});

  /** Reads and checks the form; shows each problem under its field and focuses the first. */
  function read(form: HTMLFormElement): z.output<S> | null {
    const data = new FormData(form);
    const values = Object.fromEntries(fields.map((name) => [name, textOf(data.get(name))]));
    const parsed = schema.safeParse(values);
    if (parsed.success) {
      setErrors({});
      return parsed.data;
    }
    const next: PlainErrors<N> = {};
    for (const issue of parsed.error.issues) {
      const name = issue.path[0];
      const field = fields.find((f) => f === name);
      if (field && !next[field]) next[field] = issue.message;
    }
    if (Object.keys(next).length === 0) next.form = parsed.error.issues[0]?.message ?? 'Please check the form.';
    setErrors(next);
    focusFirst(form, next);
    return null;
  }

  /** Shows the API's answer: a 400's fields under their inputs, anything else above the button. */
  function showApiError(form: HTMLFormElement | null, error: unknown) {
    const next: PlainErrors<N> = {};
    if (error instanceof ApiError) {
      const { matched, unmatched } = splitFieldErrors(error.fields, fields);
      for (const [name, message] of matched) next[name] = message;
      if (matched.length === 0 || unmatched.length > 0)
        next.form = unmatched.length > 0 && error.code === 'validation' ? unmatched.join(' ') : error.message;
    } else {
      next.form = errorMessage(error);
    }
    setErrors(next);
    if (form) focusFirst(form, next);
  }

  return { errors, setErrors, read, showApiError };
}

const textOf = (value: FormDataEntryValue | null): string => (typeof value === 'string' ? value : '');

function focusFirst(form: HTMLFormElement, errors: Record<string, string | undefined>) {
  const first = Object.keys(errors).find((name) => name !== 'form' && errors[name]);
  const input = first ? form.elements.namedItem(first) : null;
  if (input instanceof HTMLElement) input.focus();
}
