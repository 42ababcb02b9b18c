// The signed-in session, kept in localStorage under `weir.session` so it survives a reload.
// Components read it through useSession(); the api-client clears it on a 401.
import { useSyncExternalStore } from 'react';
import type { Role, User } from '../types/api.ts';

export const SESSION_KEY = 'weir.session';

export interface Session {
  token: string;
  user: User;
}

type Listener = () => void;
const listeners = new Set<Listener>();
let cached: Session | null | undefined;

function read(): Session | null {
  try {
    const raw = globalThis.localStorage?.getItem(SESSION_KEY);
    if (!raw) return null;
    const value = JSON.parse(raw) as Partial<Session>;
    if (typeof value?.token !== 'string' || typeof value.user !== 'object' || value.user === null) return null;
    return value as Session;
  } catch {
    return null;
  }
}

export function getSession(): Session | null {
  if (cached === undefined) cached = read();
  return cached;
}

// Why the last session ended, so every loader that finds no session can say "expired".
let endedBecause: 'expired' | null = null;

export function sessionEndReason(): 'expired' | null {
  return endedBecause;
}

export function setSession(session: Session | null, reason?: 'expired'): void {
  endedBecause = session ? null : reason ?? null;
  cached = session;
  if (session) localStorage.setItem(SESSION_KEY, JSON.stringify(session));
  else localStorage.removeItem(SESSION_KEY);
  for (const listener of listeners) listener();
}

/** Keep the token, refresh the user (after GET /api/me). */
export function updateSessionUser(user: User): void {
  const current = getSession();
  if (current) setSession({ ...current, user });
}

function subscribe(listener: Listener): () => void {
  listeners.add(listener);
  const onStorage = (event: StorageEvent) => {
    if (event.key === SESSION_KEY) {
      cached = read();
      listener();
    }
  };
  globalThis.addEventListener?.('storage', onStorage);
  return () => {
    listeners.delete(listener);
    globalThis.removeEventListener?.('storage', onStorage);
  };
}

export function useSession(): Session | null {
  return useSyncExternalStore(subscribe, getSession, () => null);
}

/** What each role may use; the server enforces the same, the UI only hides what would be refused. */
export const CAN = {
  readChangeLog: (role: Role | undefined) => role === 'auditor' || role === 'lead' || role === 'admin',
  manageAccounts: (role: Role | undefined) => role === 'admin',
  review: (role: Role | undefined) => role === 'lead',
  upload: (role: Role | undefined) => role === 'installer' || role === 'lead',
};

/** A same-origin path to return to after sign-in, or `/sites`. Rejects `//host` and absolute URLs. */
export function safeNext(next: string | null | undefined): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\') || next.startsWith('/sign-in')) return '/sites';
  return next;
}

/** `reason=expired` lets the sign-in page say why the user is back there. */
export function signInPath(next: string, reason?: 'expired'): string {
  return `/sign-in?next=${encodeURIComponent(next)}${reason ? `&reason=${reason}` : ''}`;
}
