// The one error class of the API and the one handler that turns any error into the JSON error body
// `{ error: { code, message, fields? } }`. Unknown errors are logged with the request id and never leak
// a stack trace or an internal message.
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ErrorBody } from '@beadroll/rules';
import type { Logger } from './logger.js';
import { pgCode } from './db-errors.js';

export type ErrorCode = ErrorBody['error']['code'];

const statusOf: Record<ErrorCode, number> = {
  validation: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

export class AppError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    status?: number,
    readonly fields?: Record<string, string>,
    /** Seconds after which a 429 or 503 may be tried again (sent as Retry-After). */
    readonly retryAfter?: number,
  ) {
    super(message);
    this.name = 'AppError';
    this.status = status ?? statusOf[code];
  }

  static validation(fields: Record<string, string>, message = 'Check the highlighted fields') {
    return new AppError('validation', message, 400, fields);
  }
  static notFound(what = 'record') {
    return new AppError('not_found', `No such ${what}`);
  }
  static forbidden(message = 'Your role does not allow this') {
    return new AppError('forbidden', message);
  }
  static conflict(message: string) {
    return new AppError('conflict', message);
  }
}

/** Field map from a zod error: dotted paths, the first message for each path. */
export function fieldsFromZod(err: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join('.') : '_body';
    fields[key] ??= issue.message;
  }
  return fields;
}

// PostgreSQL and driver errors that mean "the database is not reachable right now".
const unavailableCodes = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  '57P01',
  '57P02',
  '57P03',
  '08000',
  '08001',
  '08003',
  '08006',
]);

export function isDatabaseUnavailable(err: unknown): boolean {
  if (!(err instanceof Error)) return false;
  const e = err as Error & { code?: string; driverError?: { code?: string } };
  if (e.code && unavailableCodes.has(e.code)) return true;
  if (e.driverError?.code && unavailableCodes.has(e.driverError.code)) return true;
  // TypeORM releases a transaction's connection when the server drops it; the next statement of that
  // transaction then fails with QueryRunner(Provider)AlreadyReleasedError: the database went away too.
  // (Still logged as a warning with the request id, as every 5xx is.)
  if (e.name === 'QueryRunnerProviderAlreadyReleasedError' || e.name === 'QueryRunnerAlreadyReleasedError') return true;
  return /Connection terminated|connect ECONNREFUSED|query runner (was )?already released|timeout exceeded when trying to connect|Driver not Connected|Cannot use a pool after calling end/i.test(
    e.message,
  );
}

export function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return AppError.validation(fieldsFromZod(err));
  if (typeof err === 'object' && err !== null && 'type' in err) {
    // body-parser errors carry a `type`.
    switch (err.type) {
      case 'entity.parse.failed':
        return new AppError('validation', 'The request body is not valid JSON', 400, {
          _body: 'Not valid JSON',
        });
      case 'entity.too.large':
        return new AppError('payload_too_large', 'The request body is too large');
      case 'encoding.unsupported':
        return new AppError('validation', 'The request body encoding is not supported', 400, {
          _body: 'Send the body without a content encoding, or gzip, deflate or br',
        });
      case 'charset.unsupported':
        return new AppError('validation', 'The request body encoding is not supported', 400, {
          _body: 'Send the body in UTF-8',
        });
    }
  }
  // A deadlock or serialization failure that escaped the retrying transaction helper (lib/transaction.ts).
  const pg = (err as { code?: unknown; driverError?: { code?: unknown } }).driverError?.code ?? (err as { code?: unknown }).code;
  if (pg === '40P01' || pg === '40001')
    return new AppError('conflict', 'Someone else was saving related records at the same moment; nothing was saved. Try again.');
  if (isDatabaseUnavailable(err))
    return new AppError('unavailable', 'The database is not reachable; try again shortly');
  if (err instanceof URIError || isBadPathEncoding(err))
    return new AppError('validation', 'The address holds characters that are not valid percent-encoding', 400, {
      _path: 'Not valid percent-encoding',
    });
  const data = databaseDataError(err);
  if (data) return data;
  // Any other client error the body parser raises (a gzip body that does not inflate, a body cut short)
  // is the request's fault, never ours.
  const status = (err as { status?: unknown; expose?: unknown } | null)?.status;
  if (typeof status === 'number' && status >= 400 && status < 500 && (err as { expose?: unknown }).expose === true)
    return new AppError('validation', 'The request body could not be read', 400, {
      _body: 'The body could not be read as sent (check its content encoding and length)',
    });
  return null;
}

/** Express's router marks a path parameter it cannot decode with status 400. */
function isBadPathEncoding(err: unknown): boolean {
  const e = err as { status?: unknown; message?: unknown } | null;
  return e?.status === 400 && typeof e.message === 'string' && /Failed to decode param/.test(e.message);
}

/**
 * A value PostgreSQL refused as data (class 22: bad encoding, NUL, number out of range, text too long,
 * invalid syntax; 23514: a CHECK; 54000: too large for an index) is the client's input, not our fault:
 * 400, naming the column when the database says which one it was.
 */
function databaseDataError(err: unknown): AppError | null {
  const code = pgCode(err);
  if (!code || !(code.startsWith('22') || code === '23514' || code === '54000')) return null;
  const e = err as Record<string, unknown> & { driverError?: Record<string, unknown> };
  const d = e.driverError ?? e;
  const column = typeof d.column === 'string' ? d.column : fieldOfConstraint(d.constraint, d.table);
  const message = dataMessages[code] ?? 'This value cannot be stored';
  return AppError.validation({ [column ? camel(column) : '_body']: message }, 'Check the highlighted fields');
}

const dataMessages: Record<string, string> = {
  '22001': 'Too long',
  '22003': 'Out of range',
  '22008': 'Not a valid date or time',
  '22007': 'Not a valid date or time',
  '22021': 'Holds characters that cannot be stored',
  '22P05': 'Holds characters that cannot be stored',
  '22P02': 'Not a valid value',
  '23514': 'Not an allowed value',
  '54000': 'Too long',
};

/** PostgreSQL names an unnamed CHECK `<table>_<column>_check`. */
function fieldOfConstraint(constraint: unknown, table: unknown): string | null {
  if (typeof constraint !== 'string' || typeof table !== 'string') return null;
  const m = new RegExp(`^${table}_(\\w+?)_check\\d*$`).exec(constraint);
  return m?.[1] ?? null;
}

const camel = (s: string) => s.replace(/_([a-z])/g, (_m, c: string) => c.toUpperCase());

export function errorBody(err: AppError): ErrorBody {
  return { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } };
}

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err: unknown, req, res, next) => {
    if (res.headersSent) return next(err);
    const known = toAppError(err);
    const requestId = typeof req.id === 'string' || typeof req.id === 'number' ? String(req.id) : '';
    if (known) {
      if (known.status >= 500) logger.warn({ err, requestId }, known.message);
      if (known.retryAfter !== undefined) res.setHeader('Retry-After', String(known.retryAfter));
      res.status(known.status).json(errorBody(known));
      return;
    }
    logger.error({ err, requestId }, 'unhandled error');
    res.status(500).json({
      error: { code: 'internal', message: `Something went wrong on our side (reference ${requestId})` },
    } satisfies ErrorBody);
  };
}

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `No API route ${req.method} ${req.baseUrl}${req.path}`));
};
