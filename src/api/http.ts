/**
 * The one place the client talks HTTP. Same-origin JSON requests with the session cookie; any
 * answer outside 2xx becomes an `ApiError` carrying the server's stable error code, so stores and
 * views can react to `sheets.version_conflict` and the like without parsing text.
 */

/** A failed API call: the server's `{ error: { code, message, path? } }`, or a network failure. */
export class ApiError extends Error {
  /** HTTP status; 0 when the server could not be reached at all. */
  readonly status: number;
  /** Stable machine-readable code, e.g. `auth.invalid_credentials`, `network.unreachable`. */
  readonly code: string;
  /** Where in the request body the problem is (first validation issue), when the server says. */
  readonly path?: (string | number)[];
  /** Every other field of the error object (e.g. `currentVersion` on a version conflict). */
  readonly details: Record<string, unknown>;

  constructor(init: {
    status: number;
    code: string;
    message: string;
    path?: (string | number)[];
    details?: Record<string, unknown>;
  }) {
    super(init.message);
    this.name = 'ApiError';
    this.status = init.status;
    this.code = init.code;
    if (init.path !== undefined) this.path = init.path;
    this.details = init.details ?? {};
  }
}

export const NETWORK_ERROR_MESSAGE =
  'Cannot reach the Meander server. Check your connection and try again; nothing you typed was lost.';

export type QueryValue = string | number | boolean | undefined | null;

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** Sent as JSON. */
  body?: unknown;
  /** Sent as multipart/form-data instead of a JSON body (file uploads). */
  formData?: FormData;
  /** Appended as a query string; `undefined`, `null` and '' are left out. */
  query?: Record<string, QueryValue>;
  signal?: AbortSignal;
}

type UnauthorizedListener = (error: ApiError) => void;
let unauthorizedListener: UnauthorizedListener | null = null;

/**
 * Called when a request outside `/api/auth/` answers 401: the session ended (expired, signed out
 * in another tab). The app wires this to clear the session and send the person to sign in.
 */
export function onUnauthorized(listener: UnauthorizedListener | null): void {
  unauthorizedListener = listener;
}

export function buildUrl(path: string, query?: Record<string, QueryValue>): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

function normalisePath(raw: unknown): (string | number)[] | undefined {
  if (Array.isArray(raw))
    return raw.filter((p): p is string | number => typeof p === 'string' || typeof p === 'number');
  if (typeof raw === 'string' && raw !== '')
    return raw.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p));
  return undefined;
}

/** Turns a non-2xx response into an ApiError, whatever its body looks like. */
export async function errorFromResponse(response: Response, path: string): Promise<ApiError> {
  let body: unknown;
  try {
    body = await response.json();
  } catch {
    body = null;
  }
  const error = typeof body === 'object' && body !== null ? (body as { error?: unknown }).error : undefined;
  if (typeof error === 'object' && error !== null) {
    const { code, message, path: errorPath, ...details } = error as Record<string, unknown>;
    const normalisedPath = normalisePath(errorPath);
    return new ApiError({
      status: response.status,
      code: typeof code === 'string' ? code : `http.${response.status}`,
      message: typeof message === 'string' && message !== '' ? message : fallbackMessage(response),
      ...(normalisedPath ? { path: normalisedPath } : {}),
      details,
    });
  }
  return new ApiError({
    status: response.status,
    code: `http.${response.status}`,
    message: fallbackMessage(response),
    details: { url: path },
  });
}

function fallbackMessage(response: Response): string {
  if (response.status === 401) return 'Please sign in to continue.';
  if (response.status === 403) return 'You are not allowed to do that.';
  if (response.status === 404) return 'Not found: it may have been deleted, or it is not shared with you.';
  if (response.status === 429) return 'Too many attempts. Wait a few minutes and try again.';
  if (response.status >= 500) return `The server failed (${response.status}). Try again in a moment.`;
  return `The server refused the request (${response.status}${response.statusText ? ` ${response.statusText}` : ''}).`;
}

/** Sends one request and returns the parsed JSON body (`undefined` for 204 or an empty body). */
export async function request<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const { method = 'GET', body, formData, query, signal } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  const init: RequestInit = { method, headers, credentials: 'same-origin' };
  if (body !== undefined) {
    headers['Content-Type'] = 'application/json';
    init.body = JSON.stringify(body);
  }
  // The browser writes the multipart Content-Type with its boundary itself.
  if (formData !== undefined) init.body = formData;
  if (signal) init.signal = signal;

  let response: Response;
  try {
    response = await fetch(buildUrl(path, query), init);
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError({ status: 0, code: 'network.unreachable', message: NETWORK_ERROR_MESSAGE });
  }

  if (!response.ok) {
    const error = await errorFromResponse(response, path);
    if (error.status === 401 && !path.startsWith('/api/auth/') && unauthorizedListener)
      unauthorizedListener(error);
    throw error;
  }
  if (response.status === 204) return undefined as T;
  const text = await response.text();
  if (text === '') return undefined as T;
  try {
    return JSON.parse(text) as T;
  } catch {
    throw new ApiError({
      status: response.status,
      code: 'http.bad_json',
      message: 'The server sent an answer Meander cannot read.',
    });
  }
}

/**
 * A GET sent with If-None-Match: `null` when the server answers 304 (nothing changed), else the
 * body and the new ETag. Other failures throw an ApiError like `request`.
 */
export async function requestIfChanged(
  path: string,
  etag: string | null,
): Promise<{ body: unknown; etag: string | null } | null> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (etag) headers['If-None-Match'] = etag;
  let response: Response;
  try {
    response = await fetch(path, { method: 'GET', headers, credentials: 'same-origin', cache: 'no-store' });
  } catch {
    throw new ApiError({ status: 0, code: 'network.unreachable', message: NETWORK_ERROR_MESSAGE });
  }
  if (response.status === 304) return null;
  if (!response.ok) {
    const error = await errorFromResponse(response, path);
    if (error.status === 401 && unauthorizedListener) unauthorizedListener(error);
    throw error;
  }
  try {
    return { body: await response.json(), etag: response.headers.get('ETag') };
  } catch {
    throw new ApiError({
      status: response.status,
      code: 'http.bad_json',
      message: 'The server sent an answer Meander cannot read.',
    });
  }
}

/** Parses an ISO date string from the API; an unparseable value is a bug on the server's side. */
export function toDate(value: string | Date): Date {
  if (value instanceof Date) return value;
  const date = new Date(value);
  if (Number.isNaN(date.getTime()))
    throw new ApiError({
      status: 0,
      code: 'http.bad_date',
      message: `The server sent an unreadable date: ${value}`,
    });
  return date;
}

/** A message a person can read, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong. Try again.';
}
