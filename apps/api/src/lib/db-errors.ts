// Recognising PostgreSQL errors that the services turn into field messages.
export function pgCode(err: unknown): string | undefined {
  const e = err as { code?: unknown; driverError?: { code?: unknown } } | null;
  const code = e?.driverError?.code ?? e?.code;
  return typeof code === 'string' ? code : undefined;
}

export function isUniqueViolation(err: unknown, constraint?: string): boolean {
  if (pgCode(err) !== '23505') return false;
  if (!constraint) return true;
  const e = err as { constraint?: unknown; driverError?: { constraint?: unknown } };
  return (e.driverError?.constraint ?? e.constraint) === constraint;
}
