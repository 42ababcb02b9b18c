// A small client for the Weir API (DEVELOPERS.md, "API contract") on Node's fetch. Error
// answers `{ error: { code, message, details? } }` become ApiError; a server that cannot be
// reached becomes a CliError (exit 2) naming the server.
import { ApiError, CliError } from './errors.ts';

export const REQUEST_TIMEOUT_MS = 30_000;

export interface ApiClient {
  server: string;
  get<T>(path: string): Promise<T>;
  post<T>(path: string, body: unknown, headers?: Record<string, string>): Promise<T>;
  /** The status with the body, for routes whose success has more than one status. */
  request<T>(method: string, path: string, init?: { body?: string; headers?: Record<string, string> }): Promise<{ status: number; body: T }>;
}

/** `https://host:port` without a trailing slash; anything else is a usage error. */
export function normaliseServer(raw: string): string {
  let url: URL;
  try {
    url = new URL(raw.trim());
  } catch {
    throw new CliError(`${raw} is not a server address`, 2, 'give it as http://host:port or https://host');
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') throw new CliError(`${raw} is not an http:// or https:// address`);
  if (url.username || url.password) throw new CliError('put no user name or password in the server address');
  return `${url.origin}${url.pathname.replace(/\/+$/, '')}`;
}

function networkReason(err: unknown): string {
  const cause = (err as { cause?: { code?: string; message?: string } })?.cause;
  if ((err as Error)?.name === 'TimeoutError') return `no answer within ${REQUEST_TIMEOUT_MS / 1000} s`;
  return cause?.code ?? cause?.message ?? (err as Error)?.message ?? String(err);
}

export function createApiClient(server: string, token?: string): ApiClient {
  async function request<T>(method: string, path: string, init: { body?: string; headers?: Record<string, string> } = {}) {
    const headers: Record<string, string> = { accept: 'application/json', ...init.headers };
    if (token) headers.authorization = `Bearer ${token}`;
    let res: Response;
    try {
      res = await fetch(`${server}${path}`, { method, headers, body: init.body, signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) });
    } catch (err) {
      throw new CliError(`cannot reach the server at ${server}: ${networkReason(err)}`);
    }
    const text = await res.text();
    let body: unknown = null;
    if (text) {
      try {
        body = JSON.parse(text);
      } catch {
        body = null;
      }
    }
    if (!res.ok) {
      const error = (body as { error?: { code?: string; message?: string; details?: unknown } } | null)?.error;
      throw new ApiError(res.status, error?.code ?? `http-${res.status}`, error?.message ?? (res.statusText || 'no message'), error?.details);
    }
    if (body === null) throw new ApiError(res.status, 'bad-answer', `the server at ${server} did not answer with JSON (is it a Weir server?)`);
    return { status: res.status, body: body as T };
  }
  return {
    server,
    request,
    get: async <T>(path: string) => (await request<T>('GET', path)).body,
    post: async <T>(path: string, body: unknown, headers: Record<string, string> = {}) =>
      (await request<T>('POST', path, { body: JSON.stringify(body), headers: { 'content-type': 'application/json', ...headers } })).body,
  };
}
