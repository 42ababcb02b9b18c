// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, setUnauthorizedHandler } from './api-client.ts';
import { getSession, safeNext, SESSION_KEY, setSession } from './session.ts';

const user = { id: 1, email: 'lead@example.test', name: 'Lead', role: 'lead' as const };

beforeEach(() => setSession({ token: 'tok-1', user }));
afterEach(() => {
  vi.unstubAllGlobals();
  setSession(null);
});

describe('api-client', () => {
  it('sends the Bearer token and returns the JSON body', async () => {
    const fetch = vi.fn(async () => new Response(JSON.stringify({ ok: true }), { status: 200 }));
    vi.stubGlobal('fetch', fetch);
    expect(await api('/health')).toEqual({ ok: true });
    const init = (fetch.mock.calls[0] as unknown as [string, RequestInit])[1];
    expect((init.headers as Record<string, string>).Authorization).toBe('Bearer tok-1');
  });

  it('turns an error body into an ApiError with its code, message and details', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ error: { code: 'comment-required', message: 'a comment is required', details: [1] } }), { status: 422 })));
    const error = await api('/x').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 422, code: 'comment-required', message: 'a comment is required', details: [1] });
  });

  it('when the token has expired, then it clears the session and sends the user to sign-in with the current path', async () => {
    window.history.replaceState(null, '', '/revisions/4?x=1');
    const handler = vi.fn();
    setUnauthorizedHandler(handler);
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ error: { code: 'token-expired', message: 'expired' } }), { status: 401 })));
    await expect(api('/me')).rejects.toMatchObject({ status: 401 });
    expect(getSession()).toBeNull();
    expect(localStorage.getItem(SESSION_KEY)).toBeNull();
    expect(handler).toHaveBeenCalledWith('/revisions/4?x=1');
  });

  it('only returns to same-site paths after sign-in', () => {
    expect(safeNext('/sites/a?b=1')).toBe('/sites/a?b=1');
    expect(safeNext('//elsewhere.test/x')).toBe('/sites');
    expect(safeNext('https://elsewhere.test/')).toBe('/sites');
    expect(safeNext(null)).toBe('/sites');
  });
});
