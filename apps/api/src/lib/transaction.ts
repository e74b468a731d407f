// Transactions that survive the database's own conflict resolution. PostgreSQL ends one of two
// transactions that deadlock (40P01) or that cannot be serialized (40001); the loser's work was rolled
// back entirely, so running it again is the correct answer, not an error for the user. Every
// `dataSource.transaction(...)` of the API goes through `withConflictRetry` (see RetryingDataSource in
// db/data-source.ts): up to four tries with jittered, growing pauses; if the conflict persists the
// request ends with 409 "try again", never 500.
//
// The work inside a transaction must therefore be database work only (or harmless to repeat): e-mail
// and file uploads happen before or after it, never as part of a try that may be repeated.
import { setTimeout as sleep } from 'node:timers/promises';
import { AppError } from './errors.js';
import { pgCode } from './db-errors.js';

/** Deadlock detected, serialization failure. */
const RETRYABLE = new Set(['40P01', '40001']);

export const isTransactionConflict = (err: unknown): boolean => RETRYABLE.has(pgCode(err) ?? '');

export const CONFLICT_MESSAGE =
  'Someone else was saving related records at the same moment; nothing was saved. Try again.';

export interface RetryOptions {
  /** Tries in all, the first included. */
  attempts?: number;
  /** The pause before the n-th retry is a random time up to baseMs × 2^n (full jitter). */
  baseMs?: number;
  /** Told about each conflict that is retried (logging, tests). */
  onRetry?: (err: unknown, attempt: number) => void;
}

export async function withConflictRetry<T>(run: () => Promise<T>, opts: RetryOptions = {}): Promise<T> {
  const attempts = opts.attempts ?? 4;
  const baseMs = opts.baseMs ?? 25;
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if (!isTransactionConflict(err)) throw err;
      if (attempt >= attempts) throw new AppError('conflict', CONFLICT_MESSAGE, 409);
      opts.onRetry?.(err, attempt);
      await sleep(Math.random() * baseMs * 2 ** attempt);
    }
  }
}
