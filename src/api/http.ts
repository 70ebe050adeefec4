import type { ApiErrorBody } from '@shared/schemas';

/** A failed API call: HTTP status (0 when the server could not be reached), machine code, readable message, field. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly field?: string;

  constructor(status: number, code: string, message: string, field?: string) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.field = field;
  }
}

/** True when `error` is an ApiError, optionally with the given status and/or code. */
export function isApiError(error: unknown, match: { status?: number; code?: string } = {}): error is ApiError {
  if (!(error instanceof ApiError)) return false;
  if (match.status !== undefined && error.status !== match.status) return false;
  if (match.code !== undefined && error.code !== match.code) return false;
  return true;
}

/** The message to show for any error thrown by an API call or by code around it. */
export function errorMessage(error: unknown): string {
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong. Please try again.';
}

/**
 * Where the CSRF token comes from. The session store registers itself here, so this module never
 * imports the store (that would be a circular import: the store calls the API through this module).
 */
export interface CsrfSource {
  token(): string;
  /** Re-fetch GET /api/auth/session so token() returns a fresh token. */
  refresh(): Promise<void>;
}

let csrfSource: CsrfSource | null = null;
let unauthenticatedHandler: ((path: string) => void) | null = null;

/** Register the CSRF token source (the session store does this when it is created). */
export function registerCsrfSource(source: CsrfSource | null): void {
  csrfSource = source;
}

/** Register what happens when the server says the session is gone (401 unauthenticated). */
export function onUnauthenticated(handler: ((path: string) => void) | null): void {
  unauthenticatedHandler = handler;
}

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  body?: unknown;
  query?: Record<string, string | number | boolean | undefined>;
  signal?: AbortSignal;
}

const WRITE_METHODS: ReadonlySet<HttpMethod> = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

function withQuery(path: string, query: RequestOptions['query']): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined) params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}${path.includes('?') ? '&' : '?'}${text}` : path;
}

async function readBody(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return text;
  }
}

function toApiError(status: number, body: unknown): ApiError {
  const error = (body as Partial<ApiErrorBody> | undefined)?.error;
  if (error && typeof error === 'object' && typeof error.code === 'string') {
    return new ApiError(status, error.code, error.message || `Request failed (${status})`, error.field);
  }
  // Proxies and crashed servers answer with HTML or nothing; still give the person a sentence.
  const fallback: Record<number, string> = {
    401: 'Please sign in again.',
    403: 'You do not have access to this.',
    404: 'Not found.',
    429: 'Too many attempts. Wait a minute and try again.',
    502: 'The server is not answering. Try again in a moment.',
    503: 'The server is not ready. Try again in a moment.',
  };
  return new ApiError(status, 'http_error', fallback[status] ?? `The request failed (HTTP ${status}).`);
}

async function send(method: HttpMethod, path: string, options: RequestOptions, extraHeaders: Record<string, string> = {}): Promise<Response> {
  const headers: Record<string, string> = { Accept: 'application/json', ...extraHeaders };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';
  if (WRITE_METHODS.has(method) && csrfSource) {
    const token = csrfSource.token();
    if (token) headers['X-CSRF-Token'] = token;
  }
  try {
    return await fetch(withQuery(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(0, 'network', 'Cannot reach the server. Check your connection and try again.');
  }
}

/** Send one JSON request to the API and return the parsed body; throws ApiError on any failure. */
export async function request<T>(method: HttpMethod, path: string, options: RequestOptions = {}): Promise<T> {
  let response = await send(method, path, options);
  let body = await readBody(response);

  if (response.status === 403 && csrfSource && WRITE_METHODS.has(method) && toApiError(403, body).code === 'csrf_invalid') {
    // The session id (and so the token) changes at sign-in and on expiry: fetch the current one and try once more.
    await csrfSource.refresh();
    response = await send(method, path, options);
    body = await readBody(response);
  }

  if (!response.ok) {
    const error = toApiError(response.status, body);
    if (error.status === 401 && error.code === 'unauthenticated') unauthenticatedHandler?.(path);
    throw error;
  }
  return body as T;
}

/** A GET that may answer 304: the body and entity tag of a new answer, or notModified when it still matches `etag`. */
export type ConditionalAnswer<T> = { notModified: false; body: T; etag: string | null } | { notModified: true; etag: string };

/** GET with If-None-Match (the API's answers are not kept by the browser, so the caller keeps the tag); throws ApiError like request(). */
export async function getConditional<T>(path: string, etag: string | null): Promise<ConditionalAnswer<T>> {
  const response = await send('GET', path, {}, etag ? { 'If-None-Match': etag } : {});
  if (response.status === 304 && etag) return { notModified: true, etag };
  const body = await readBody(response);
  if (!response.ok) {
    const error = toApiError(response.status, body);
    if (error.status === 401 && error.code === 'unauthenticated') unauthenticatedHandler?.(path);
    throw error;
  }
  return { notModified: false, body: body as T, etag: response.headers.get('ETag') };
}

/** The five verbs as small helpers over request(). */
export const http = {
  get: <T>(path: string, options?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PATCH', path, { ...options, body }),
  delete: <T = void>(path: string, options?: RequestOptions) => request<T>('DELETE', path, options),
};

export interface UploadOptions {
  /** Called as the request body goes out: bytes sent so far and the body's total, in bytes. */
  onProgress?: (sentBytes: number, totalBytes: number) => void;
  /** Called once the whole body has gone out (the server is working on it now). */
  onSent?: () => void;
  signal?: AbortSignal;
}

function sendForm(path: string, form: FormData, options: UploadOptions): Promise<{ status: number; body: unknown }> {
  // XMLHttpRequest rather than fetch: fetch reports no progress of a request body, and a 200 MB
  // logger file on a farm connection takes long enough that people need to see it move.
  return new Promise((resolve, reject) => {
    if (options.signal?.aborted) return reject(new DOMException('The upload was cancelled', 'AbortError'));
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.setRequestHeader('Accept', 'application/json');
    const token = csrfSource?.token();
    if (token) xhr.setRequestHeader('X-CSRF-Token', token);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) options.onProgress?.(event.loaded, event.total);
    };
    xhr.upload.onload = () => options.onSent?.();
    xhr.onload = () => {
      const text = xhr.responseText;
      let body: unknown = undefined;
      if (text) {
        try {
          body = JSON.parse(text) as unknown;
        } catch {
          body = text;
        }
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload was cut off: the server could not be reached or closed the connection. Check your connection and try again.'));
    xhr.onabort = () => reject(new DOMException('The upload was cancelled', 'AbortError'));
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}

/**
 * POST a multipart form (files and text fields) with the CSRF header, reporting upload progress;
 * returns the parsed JSON body, throws ApiError like request() does.
 */
export async function upload<T>(path: string, form: FormData, options: UploadOptions = {}): Promise<T> {
  let { status, body } = await sendForm(path, form, options);
  if (status === 403 && csrfSource && toApiError(403, body).code === 'csrf_invalid') {
    await csrfSource.refresh();
    ({ status, body } = await sendForm(path, form, options));
  }
  if (status < 200 || status >= 300) {
    const error = toApiError(status, body);
    if (error.status === 401 && error.code === 'unauthenticated') unauthenticatedHandler?.(path);
    throw error;
  }
  return body as T;
}
