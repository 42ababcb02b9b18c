import { redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { ApiError } from '../lib/api-client.ts';
import { queryClient } from '../lib/query-client.ts';
import { getSession, sessionEndReason, setSession, signInPath, updateSessionUser } from '../lib/session.ts';
import { meQueryOptions } from '../features/auth/api/get-me.ts';
import type { User } from '../types/api.ts';

function pathOf(request: Request): string {
  const url = new URL(request.url);
  return `${url.pathname}${url.search}`;
}

/**
 * Every page but sign-in: a session is needed, checked with GET /api/me once per load. The layout
 * and each page's loader call it (React Router runs them side by side; the query is shared), so
 * no page asks the API anything before the session is known to be good.
 */
export async function requireSession({ request }: Pick<LoaderFunctionArgs, 'request'>): Promise<User> {
  if (!getSession()) throw redirect(signInPath(pathOf(request), sessionEndReason() ?? undefined));
  try {
    const { user } = await queryClient.ensureQueryData(meQueryOptions());
    updateSessionUser(user);
    return user;
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) {
      setSession(null, 'expired');
      queryClient.clear();
      throw redirect(signInPath(pathOf(request), 'expired'));
    }
    throw error;
  }
}

