// The one way the web app talks to the API: fetch with the session cookie, JSON in and out, responses
// parsed with the shared zod schemas, and every failure turned into an ApiError the screens can show.
import { errorBodySchema, type errorCodes } from '@beadroll/rules';
import type { z } from 'zod';
import { env } from '@/config/env';

export type ApiErrorCode = (typeof errorCodes)[number] | 'network';

export class ApiError extends Error {
  override readonly name = 'ApiError';
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly fields: Readonly<Record<string, string>> = {},
  ) {
    super(message);
  }
}

const fallbackMessages: Record<number, string> = {
  400: 'Some of what was entered is not valid.',
  401: 'Please sign in again.',
  403: 'Your role does not allow this.',
  404: 'This record does not exist or is not yours to see.',
  409: 'Someone else changed this record; reload to see their change.',
  413: 'That is too large to send.',
  429: 'Too many attempts. Wait a few minutes and try again.',
  503: 'Beadroll is not available right now. Try again in a moment.',
};

function codeForStatus(status: number): ApiErrorCode {
  const byStatus: Record<number, ApiErrorCode> = {
    400: 'validation',
    401: 'unauthenticated',
    403: 'forbidden',
    404: 'not_found',
    409: 'conflict',
    413: 'payload_too_large',
    429: 'rate_limited',
    503: 'unavailable',
  };
  return byStatus[status] ?? 'internal';
}

/** Turns a failed response (its status and parsed body, if any) into an ApiError. Pure, so it is tested. */
export function toApiError(status: number, body: unknown): ApiError {
  const parsed = errorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error;
    return new ApiError(status, code, message, fields ?? {});
  }
  return new ApiError(
    status,
    codeForStatus(status),
    fallbackMessages[status] ?? 'Something went wrong on the server. Try again; if it keeps happening, tell your administrator.',
  );
}

let unauthenticatedHandler: (() => void) | null = null;

/** The app decides what a 401 means (go to sign-in with a return path); the client only reports it. */
export function setUnauthenticatedHandler(handler: (() => void) | null): void {
  unauthenticatedHandler = handler;
}

type Query = Record<string, string | number | boolean | undefined | null>;

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  query?: Query;
  signal?: AbortSignal;
  /** False for calls where a 401 is an answer, not an expired session (sign-in, "who am I"). */
  redirectOn401?: boolean;
}

export function buildUrl(path: string, query?: Query): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== null && value !== '') search.set(key, String(value));
  }
  const qs = search.toString();
  return `${env.VITE_API_BASE}${path}${qs ? `?${qs}` : ''}`;
}

async function send(path: string, options: RequestOptions): Promise<Response> {
  const { method = 'GET', body, query, signal, redirectOn401 = true } = options;
  // A FormData body (an upload) goes as multipart; the browser writes its boundary into the header.
  const multipart = body instanceof FormData;
  let response: Response;
  try {
    response = await fetch(buildUrl(path, query), {
      method,
      credentials: 'include',
      headers: {
        Accept: 'application/json',
        ...(body === undefined || multipart ? {} : { 'Content-Type': 'application/json' }),
      },
      body: body === undefined ? undefined : multipart ? body : JSON.stringify(body),
      signal,
    });
  } catch (cause) {
    if (signal?.aborted) throw cause;
    throw new ApiError(0, 'network', 'Beadroll cannot reach its server. Check the connection and try again.');
  }
  if (!response.ok) {
    const errorBody: unknown = await response.json().catch(() => null);
    const error = toApiError(response.status, errorBody);
    if (response.status === 401 && redirectOn401) unauthenticatedHandler?.();
    throw error;
  }
  return response;
}

/** A request whose answer is parsed with `schema`; a body that does not match is reported, not trusted. */
export async function apiRequest<S extends z.ZodType>(
  path: string,
  schema: S,
  options: RequestOptions = {},
): Promise<z.output<S>> {
  const response = await send(path, options);
  const json: unknown = await response.json().catch(() => undefined);
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    console.error(`Unexpected answer from ${path}`, parsed.error.issues);
    throw new ApiError(response.status, 'internal', 'The server sent an answer this page does not understand.');
  }
  return parsed.data;
}

/** A request whose answer carries no body worth reading (204, 202). */
export async function apiSend(path: string, options: RequestOptions = {}): Promise<void> {
  await send(path, options);
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}
