/**
 * The one way the client talks to the Benchrelay API. Every failure becomes an ApiError carrying the
 * server's `{ error: { code, message, fields } }`, so screens can branch on `code` and show field errors.
 */

export type FieldErrors = Record<string, string>;

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fieldErrors: FieldErrors;
  /** Anything else the server put in the error object (for example the e-mail on `no_access`). */
  readonly details: Record<string, unknown>;
  /** The request's id (X-Request-Id), for a person to quote when asking for help; null when none came back. */
  readonly requestId: string | null;

  constructor(init: {
    status: number;
    code: string;
    message: string;
    fieldErrors?: FieldErrors;
    details?: Record<string, unknown>;
    requestId?: string | null;
  }) {
    super(init.message);
    this.name = 'ApiError';
    this.status = init.status;
    this.code = init.code;
    this.fieldErrors = init.fieldErrors ?? {};
    this.details = init.details ?? {};
    this.requestId = init.requestId ?? null;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  method?: Method;
  body?: unknown;
  signal?: AbortSignal;
  headers?: Record<string, string>;
}

export async function apiRequest<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const { method = 'GET', body, signal, headers = {} } = options;
  const init: RequestInit = {
    method,
    signal,
    // The session cookie only ever goes to our own origin (Vite proxies /api and /auth in development).
    credentials: 'same-origin',
    headers: { Accept: 'application/json', ...headers },
  };
  if (body !== undefined) {
    init.body = JSON.stringify(body);
    (init.headers as Record<string, string>)['Content-Type'] = 'application/json';
  }

  let response: Response;
  try {
    response = await fetch(path, init);
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError({
      status: 0,
      code: 'network_error',
      message: 'Benchrelay could not be reached. Check the connection and try again.',
    });
  }

  const payload = await readJson(response);
  if (!response.ok) throw toApiError(response.status, payload, response.headers?.get('X-Request-Id') ?? null);
  return payload as T;
}

async function readJson(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    // A proxy or a crashed server can answer with HTML; that is an error for the caller, not a parse crash.
    return undefined;
  }
}

function toApiError(status: number, payload: unknown, headerRequestId: string | null): ApiError {
  const error = isRecord(payload) && isRecord(payload.error) ? payload.error : undefined;
  if (!error) {
    return new ApiError({ status, code: fallbackCode(status), message: fallbackMessage(status), requestId: headerRequestId });
  }
  const { code, message, fields, requestId, ...details } = error;
  return new ApiError({
    status,
    code: typeof code === 'string' ? code : fallbackCode(status),
    message: typeof message === 'string' ? message : fallbackMessage(status),
    fieldErrors: isRecord(fields) ? stringEntries(fields) : undefined,
    details,
    requestId: typeof requestId === 'string' ? requestId : headerRequestId,
  });
}

function fallbackCode(status: number): string {
  if (status === 401) return 'unauthenticated';
  if (status === 403) return 'forbidden';
  if (status === 404) return 'not_found';
  return status >= 500 ? 'server_error' : 'request_failed';
}

function fallbackMessage(status: number): string {
  if (status >= 500) return 'Benchrelay ran into a problem on its side. Try again in a moment.';
  return `The request failed (HTTP ${status}).`;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function stringEntries(record: Record<string, unknown>): FieldErrors {
  const out: FieldErrors = {};
  for (const [key, value] of Object.entries(record)) {
    if (typeof value === 'string') out[key] = value;
  }
  return out;
}

export const api = {
  get: <T>(path: string, signal?: AbortSignal) => apiRequest<T>(path, { signal }),
  post: <T>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'POST', body }),
  put: <T>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'PUT', body }),
  patch: <T>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'PATCH', body }),
  delete: <T>(path: string) => apiRequest<T>(path, { method: 'DELETE' }),
};
