import { type z } from 'zod';
import { RulesInputError } from './rules-input-error.js';

type Issue = z.core.$ZodIssue;

// A union (e.g. a named criteria set or a custom one) reports one list of issues per branch; the branch
// worth showing is the one that got past the type check, so the user sees "maxSingle: Required" and
// not "expected string".
function pickUnionBranch(branches: Issue[][]): Issue[] {
  const typed = branches.filter((b) => !b.some((i) => i.code === 'invalid_type' && i.path.length === 0));
  return typed[0] ?? branches[branches.length - 1] ?? [];
}

function collect(issues: readonly Issue[], prefix: PropertyKey[], out: Record<string, string>): void {
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === 'invalid_union' && issue.errors.length > 0) {
      collect(pickUnionBranch(issue.errors), path, out);
      continue;
    }
    const key = path.map(String).join('.');
    if (!(key in out)) out[key] = issue.message;
  }
}

export function fieldsOf(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  collect(error.issues, [], out);
  return out;
}

/** Parse with a rules schema; a failure becomes a RulesInputError naming every bad field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const parsed = schema.safeParse(input);
  if (!parsed.success) throw new RulesInputError(fieldsOf(parsed.error));
  return parsed.data;
}
