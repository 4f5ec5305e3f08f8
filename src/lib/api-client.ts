/**
 * The client's one way to talk to the API: JSON in and out, the session cookie (same origin), the
 * CSRF token on every mutation, and one error type built from the API's one error shape
 * (`shared/errors.ts`). Fetchers in `features/<feature>/api` call these helpers and never `fetch`.
 */
import { type ZodType } from 'zod';
import { apiErrorSchema, errorCodes } from '@shared/errors';
import { csrfResponseSchema } from '@shared/users';

/** An error from the API (or from reaching it), with the fields of the shared error shape. */
export class ApiError extends Error {
  override name = 'ApiError';
  /** HTTP status; 0 when the server could not be reached or the request was cancelled. */
  readonly status: number;
  readonly code: string;
  readonly details: unknown;
  /** Seconds to wait before trying again, from a `Retry-After` header (rate limits). */
  readonly retryAfter: number | null;

  constructor(status: number, code: string, message: string, details?: unknown, retryAfter: number | null = null) {
    super(message);
    this.status = status;
    this.code = code;
    this.details = details;
    this.retryAfter = retryAfter;
  }
}

export function isApiError(error: unknown, code?: string): error is ApiError {
  return error instanceof ApiError && (code === undefined || error.code === code);
}

/** A readable sentence for any error a query or mutation may throw. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}

export const CSRF_HEADER = 'X-CSRF-Token';
const CSRF_PATH = '/api/auth/csrf';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export type QueryValue = string | number | boolean | null | undefined;

export interface RequestOptions<T> {
  /** A JSON-serialisable body (sent as application/json) or FormData (sent as multipart). */
  body?: unknown;
  /** Query-string parameters; null and undefined are left out. */
  query?: Record<string, QueryValue>;
  /** Validates the response body; a mismatch is an ApiError with code `bad_response`. */
  schema?: ZodType<T>;
  signal?: AbortSignal;
  headers?: Record<string, string>;
}

// --- CSRF token ---------------------------------------------------------------------------

let csrfToken: Promise<string> | null = null;

async function fetchCsrfToken(): Promise<string> {
  const response = await send(CSRF_PATH, { method: 'GET', headers: { Accept: 'application/json' } });
  const body = await readBody(response);
  if (!response.ok) throw toApiError(response, body);
  const parsed = csrfResponseSchema.safeParse(body);
  if (!parsed.success) throw new ApiError(response.status, 'bad_response', 'The server sent an unreadable CSRF token.');
  return parsed.data.token;
}

/** The session's CSRF token, fetched once and cached until `resetCsrfToken()`. */
export function getCsrfToken(): Promise<string> {
  if (!csrfToken) {
    csrfToken = fetchCsrfToken();
    // A failed fetch is not cached: the next mutation tries again.
    csrfToken.catch(() => {
      csrfToken = null;
    });
  }
  return csrfToken;
}

/** Forget the cached token; call after sign-in and sign-out, which start a new session. */
export function resetCsrfToken(): void {
  csrfToken = null;
}

// --- requests -----------------------------------------------------------------------------

export function buildUrl(path: string, query?: Record<string, QueryValue>): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== null && value !== undefined) params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}${path.includes('?') ? '&' : '?'}${text}` : path;
}

async function send(url: string, init: RequestInit): Promise<Response> {
  try {
    return await fetch(url, { credentials: 'same-origin', ...init });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(0, 'network_error', 'Could not reach the Scorecourt server. Check your connection and try again.');
  }
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204 || response.status === 205) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  const type = response.headers.get('content-type') ?? '';
  if (!type.includes('json')) return text;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return text;
  }
}

function retryAfterSeconds(value: string | null): number | null {
  if (!value) return null;
  const seconds = Number(value);
  if (Number.isFinite(seconds)) return Math.max(0, Math.round(seconds));
  const date = Date.parse(value);
  return Number.isNaN(date) ? null : Math.max(0, Math.round((date - Date.now()) / 1000));
}

const fallbackMessages: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'Please sign in.',
  403: 'You do not have permission to do that.',
  404: 'Not found.',
  409: 'That conflicts with the current state. Reload and try again.',
  410: 'This is no longer available.',
  413: 'The file is too large.',
  429: 'Too many attempts. Wait a few minutes and try again.',
};

function errorFromBody(status: number, statusText: string, body: unknown, retryAfter: number | null): ApiError {
  const parsed = apiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(status, code, message, details, retryAfter);
  }
  const message =
    fallbackMessages[status] ??
    (status >= 500
      ? `The server had a problem (${status}${statusText ? ` ${statusText}` : ''}). Try again in a moment.`
      : `The server answered ${status}${statusText ? ` ${statusText}` : ''}.`);
  return new ApiError(status, status >= 500 ? errorCodes.internal : 'http_error', message, undefined, retryAfter);
}

function toApiError(response: Response, body: unknown): ApiError {
  return errorFromBody(response.status, response.statusText, body, retryAfterSeconds(response.headers.get('retry-after')));
}

function validate<T>(status: number, body: unknown, schema?: ZodType<T>): T {
  if (!schema) return body as T;
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    throw new ApiError(status, 'bad_response', 'The server sent a response this page cannot read. Reload the page.', parsed.error.issues);
  }
  return parsed.data;
}

function isCsrfRefusal(error: ApiError): boolean {
  return error.status === 403 && error.code === errorCodes.csrf;
}

/**
 * One API request. Mutations carry the CSRF token; a 403 `csrf_invalid` (the session changed
 * under us) refetches the token and retries once. Non-2xx answers throw an ApiError.
 */
export async function request<T = unknown>(method: HttpMethod, path: string, options: RequestOptions<T> = {}): Promise<T> {
  const url = buildUrl(path, options.query);
  const mutation = !SAFE_METHODS.has(method);
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData;

  const attempt = async (): Promise<T> => {
    const headers: Record<string, string> = { Accept: 'application/json', ...options.headers };
    let body: BodyInit | undefined;
    if (options.body !== undefined) {
      if (isForm) body = options.body as FormData;
      else {
        headers['Content-Type'] = 'application/json';
        body = JSON.stringify(options.body);
      }
    }
    if (mutation) headers[CSRF_HEADER] = await getCsrfToken();
    const response = await send(url, { method, headers, body, signal: options.signal });
    const data = await readBody(response);
    if (!response.ok) throw toApiError(response, data);
    return validate(response.status, data, options.schema);
  };

  try {
    return await attempt();
  } catch (error) {
    if (mutation && error instanceof ApiError && isCsrfRefusal(error)) {
      resetCsrfToken();
      return attempt();
    }
    throw error;
  }
}

export const api = {
  get: <T = unknown>(path: string, options?: Omit<RequestOptions<T>, 'body'>) => request<T>('GET', path, options),
  post: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('POST', path, { ...options, body }),
  put: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('PUT', path, { ...options, body }),
  patch: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('PATCH', path, { ...options, body }),
  delete: <T = unknown>(path: string, options?: Omit<RequestOptions<T>, 'body'>) => request<T>('DELETE', path, options),
};

// --- uploads with progress ----------------------------------------------------------------

export interface UploadProgress {
  loaded: number;
  /** null when the browser cannot tell the total size. */
  total: number | null;
  /** loaded / total in [0, 1], or null when the total is unknown. */
  fraction: number | null;
}

export interface UploadOptions<T> {
  /** POST (default) or PUT. */
  method?: 'POST' | 'PUT';
  onProgress?: (progress: UploadProgress) => void;
  schema?: ZodType<T>;
  signal?: AbortSignal;
  query?: Record<string, QueryValue>;
}

function parseXhrBody(xhr: XMLHttpRequest): unknown {
  const text = xhr.responseText;
  if (!text) return undefined;
  if (!(xhr.getResponseHeader('content-type') ?? '').includes('json')) return text;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return text;
  }
}

function uploadOnce<T>(url: string, form: FormData, token: string, options: UploadOptions<T>): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    const abort = () => xhr.abort();
    xhr.open(options.method ?? 'POST', url);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.setRequestHeader(CSRF_HEADER, token);
    xhr.upload.onprogress = (event) => {
      const total = event.lengthComputable && event.total > 0 ? event.total : null;
      options.onProgress?.({ loaded: event.loaded, total, fraction: total ? Math.min(1, event.loaded / total) : null });
    };
    xhr.onload = () => {
      options.signal?.removeEventListener('abort', abort);
      const body = parseXhrBody(xhr);
      if (xhr.status < 200 || xhr.status >= 300) {
        reject(errorFromBody(xhr.status, xhr.statusText, body, retryAfterSeconds(xhr.getResponseHeader('retry-after'))));
        return;
      }
      try {
        resolve(validate(xhr.status, body, options.schema));
      } catch (error) {
        reject(error);
      }
    };
    xhr.onerror = () => {
      options.signal?.removeEventListener('abort', abort);
      reject(new ApiError(0, 'network_error', 'The upload was interrupted. Check your connection and try again.'));
    };
    xhr.onabort = () => {
      options.signal?.removeEventListener('abort', abort);
      reject(new ApiError(0, 'aborted', 'The upload was cancelled.'));
    };
    if (options.signal?.aborted) {
      reject(new ApiError(0, 'aborted', 'The upload was cancelled.'));
      return;
    }
    options.signal?.addEventListener('abort', abort, { once: true });
    xhr.send(form);
  });
}

/**
 * Uploads a multipart form (e.g. a holdout file) with progress events from
 * `XMLHttpRequest.upload.onprogress`, which `fetch` cannot report. Same CSRF rules as `request`.
 */
export async function upload<T = unknown>(path: string, form: FormData, options: UploadOptions<T> = {}): Promise<T> {
  const url = buildUrl(path, options.query);
  try {
    return await uploadOnce(url, form, await getCsrfToken(), options);
  } catch (error) {
    if (error instanceof ApiError && isCsrfRefusal(error)) {
      resetCsrfToken();
      return uploadOnce(url, form, await getCsrfToken(), options);
    }
    throw error;
  }
}
