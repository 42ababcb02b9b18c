import { createBrowserRouter, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { RouteError } from '../components/route-error.tsx';
import { Loading } from '../components/feedback.tsx';
import { ApiError, setUnauthorizedHandler } from '../lib/api-client.ts';
import { queryClient } from '../lib/query-client.ts';
import { getSession, setSession, signInPath, updateSessionUser } from '../lib/session.ts';
import { meQueryOptions } from '../features/auth/api/get-me.ts';
import { AppLayout } from './routes/app-layout.tsx';

function pathOf(request: Request): string {
  const url = new URL(request.url);
  return `${url.pathname}${url.search}`;
}

/** Every page but sign-in: a session is needed, and it is checked with GET /api/me once per load. */
async function requireSession({ request }: LoaderFunctionArgs) {
  if (!getSession()) throw redirect(signInPath(pathOf(request)));
  try {
    const { user } = await queryClient.ensureQueryData(meQueryOptions());
    updateSessionUser(user);
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) {
      setSession(null);
      queryClient.clear();
      throw redirect(signInPath(pathOf(request), 'expired'));
    }
    throw error;
  }
  return null;
}

// Each page is its own chunk (React Router `lazy`), so the first load carries only the shell.
export const router = createBrowserRouter([
  {
    path: '/sign-in',
    lazy: () => import('./routes/sign-in.tsx'),
    HydrateFallback: () => <Loading />,
  },
  {
    path: '/',
    id: 'app',
    loader: requireSession,
    Component: AppLayout,
    ErrorBoundary: RouteError,
    HydrateFallback: () => <Loading />,
    children: [
      { index: true, loader: () => redirect('/sites') },
      {
        ErrorBoundary: RouteError,
        children: [
          { path: 'sites', lazy: () => import('./routes/sites.tsx') },
          { path: 'sites/:siteId', lazy: () => import('./routes/site.tsx') },
          { path: 'revisions/:revisionId', lazy: () => import('./routes/review.tsx') },
          { path: 'change-log', lazy: () => import('./routes/change-log.tsx') },
          { path: 'accounts', lazy: () => import('./routes/accounts.tsx') },
          { path: '*', loader: () => { throw new Response('There is nothing at this address.', { status: 404 }); } },
        ],
      },
    ],
  },
]);

// An expired token met anywhere (a query, a mutation) comes back through sign-in to this page.
setUnauthorizedHandler((next) => {
  queryClient.clear();
  void router.navigate(signInPath(next, 'expired'), { replace: true });
});
