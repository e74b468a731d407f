import type { Request } from 'express';

/** A path parameter as a string ('' when absent), for handlers whose middleware chain widens the type. */
export function pathParam(req: Request, name: string): string {
  const v: unknown = (req.params as Record<string, unknown>)[name];
  return typeof v === 'string' ? v : '';
}
