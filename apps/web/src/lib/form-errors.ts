// Puts the API's answer to a form where the person filling it in will look: a 400's `fields` next to
// the matching inputs, anything else (a conflict, a field the form does not show) above the buttons.
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError, errorMessage } from './api-client';

export const FORM_ERROR = 'root.server' as const;

export interface SplitFieldErrors<N extends string> {
  matched: Array<[N, string]>;
  unmatched: string[];
}

/**
 * Matches the API's dotted field paths to the form's field names: an exact name wins, otherwise the
 * nearest parent ("shopIds.2" → "shopIds"). Paths the form does not have are returned as messages.
 */
export function splitFieldErrors<N extends string>(
  fields: Readonly<Record<string, string>>,
  formFields: readonly N[],
): SplitFieldErrors<N> {
  const matched: Array<[N, string]> = [];
  const unmatched: string[] = [];
  for (const [path, message] of Object.entries(fields)) {
    const segments = path.split('.');
    let target: N | undefined;
    while (segments.length > 0 && !target) {
      const candidate = segments.join('.');
      target = formFields.find((f) => f === candidate);
      segments.pop();
    }
    if (target && !matched.some(([name]) => name === target)) matched.push([target, message]);
    else if (!target) unmatched.push(path === '' ? message : `${path}: ${message}`);
  }
  return { matched, unmatched };
}

/** Shows `error` on a react-hook-form form. Returns true when at least one field got its message. */
export function applyApiError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  formFields: readonly Path<T>[],
): boolean {
  if (!(error instanceof ApiError)) {
    setError(FORM_ERROR, { type: 'server', message: errorMessage(error) });
    return false;
  }
  const { matched, unmatched } = splitFieldErrors(error.fields, formFields);
  matched.forEach(([name, message], index) => {
    setError(name, { type: 'server', message }, { shouldFocus: index === 0 });
  });
  if (matched.length === 0 || unmatched.length > 0) {
    const message = unmatched.length > 0 && error.code === 'validation' ? unmatched.join(' ') : error.message;
    setError(FORM_ERROR, { type: 'server', message });
  }
  return matched.length > 0;
}
