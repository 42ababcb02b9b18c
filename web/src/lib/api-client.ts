// One fetch wrapper for the API: adds the Bearer token, turns `{ error: { code, message, details } }`
// into an ApiError, and on a 401 clears the session and sends the user to sign-in, then back.
import { getSession, setSession, signInPath } from './session.ts';

export interface ApiErrorBody {
  code: string;
  message: string;
  details?: unknown;
}

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(status: number, body: ApiErrorBody) {
    super(body.message);
    this.name = 'ApiError';
    this.status = status;
    this.code = body.code;
    this.details = body.details;
  }
}

type UnauthorizedHandler = (next: string) => void;

// The router installs a handler that navigates without a reload; this default works anywhere.
let onUnauthorized: UnauthorizedHandler = (next) => {
  globalThis.location?.assign(signInPath(next, 'expired'));
};

export function setUnauthorizedHandler(handler: UnauthorizedHandler): void {
  onUnauthorized = handler;
}

function currentPath(): string {
  const loc = globalThis.location;
  return loc ? `${loc.pathname}${loc.search}${loc.hash}` : '/';
}

export interface RequestOptions {
  method?: string;
  query?: Record<string, string | number | boolean | null | undefined>;
  json?: unknown;
  body?: BodyInit;
  headers?: Record<string, string>;
  signal?: AbortSignal;
  /** Sign-in itself answers 401 for a wrong password; that is not an expired session. */
  skipAuthRedirect?: boolean;
}

export function apiUrl(path: string, query?: RequestOptions['query']): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return `/api${path}${qs ? `?${qs}` : ''}`;
}

async function errorFrom(response: Response): Promise<ApiError> {
  let body: ApiErrorBody = { code: `http-${response.status}`, message: response.statusText || `request failed (${response.status})` };
  try {
    const parsed = (await response.json()) as { error?: Partial<ApiErrorBody> };
    if (parsed?.error && typeof parsed.error.message === 'string') {
      body = { code: String(parsed.error.code ?? body.code), message: parsed.error.message, details: parsed.error.details };
    }
  } catch {
    // not JSON: keep the status text
  }
  return new ApiError(response.status, body);
}

export async function apiFetch(path: string, options: RequestOptions = {}): Promise<Response> {
  const headers: Record<string, string> = { Accept: 'application/json', ...options.headers };
  const session = getSession();
  if (session) headers.Authorization = `Bearer ${session.token}`;
  let body = options.body;
  if (options.json !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(options.json);
  }
  let response: Response;
  try {
    response = await fetch(apiUrl(path, options.query), { method: options.method ?? 'GET', headers, body, signal: options.signal });
  } catch (cause) {
    if ((cause as Error)?.name === 'AbortError') throw cause;
    throw new ApiError(0, { code: 'network', message: 'The server could not be reached. Check your connection and try again.' });
  }
  if (!response.ok) {
    const error = await errorFrom(response);
    if (response.status === 401 && !options.skipAuthRedirect && session) {
      setSession(null, 'expired');
      onUnauthorized(currentPath());
    }
    throw error;
  }
  return response;
}

export async function api<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const response = await apiFetch(path, options);
  if (response.status === 204) return undefined as T;
  return (await response.json()) as T;
}

/** A file from the API as a Blob (thumbnails, CSV export): `<img src>` cannot send the token. */
export async function apiBlob(path: string, options: RequestOptions = {}): Promise<Blob> {
  const response = await apiFetch(path, { ...options, headers: { Accept: '*/*', ...options.headers } });
  return response.blob();
}

/** Loaders turn a 404 into a Response so the route's error element says "not found". */
export function notFoundIf404(error: unknown): never {
  if (error instanceof ApiError && error.status === 404) {
    throw new Response(error.message, { status: 404, statusText: 'Not found' });
  }
  throw error;
}
