// The project's text rule (textProblem from @beadroll/rules) applied to every request before any route
// sees it: a string anywhere in the JSON body or the query string that holds a control character or half
// of a surrogate pair is refused with 400 and its field named. The zod schemas of the routes say the
// same per field; this guard keeps routes that read a raw value (and routes added later) from ever
// handing such text to PostgreSQL, which would answer with a data error.
import type { RequestHandler } from 'express';
import { textProblem } from '@beadroll/rules';
import { AppError } from './errors.js';

const MAX_DEPTH = 32;

/** Field path → problem for every unacceptable string (keys included) in value. */
export function textProblems(value: unknown, root = ''): Record<string, string> {
  const fields: Record<string, string> = {};
  const walk = (v: unknown, path: string, depth: number) => {
    if (typeof v === 'string') {
      const problem = textProblem(v, true);
      if (problem) fields[path || '_body'] ??= problem;
      return;
    }
    if (v === null || typeof v !== 'object' || depth > MAX_DEPTH) return;
    for (const [k, child] of Object.entries(v as Record<string, unknown>)) {
      const at = path ? `${path}.${k}` : k;
      const keyProblem = textProblem(k, false);
      if (keyProblem) fields[path || '_body'] ??= keyProblem;
      else walk(child, at, depth + 1);
    }
  };
  walk(value, root, 0);
  return fields;
}

export const refuseUnsafeText: RequestHandler = (req, _res, next) => {
  const fields = { ...textProblems(req.query), ...textProblems(req.body as unknown) };
  if (Object.keys(fields).length > 0) return next(AppError.validation(fields));
  next();
};
