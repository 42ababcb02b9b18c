import { createBrowserRouter, redirect } from 'react-router-dom';
import { RouteError } from '../components/route-error.tsx';
import { Loading } from '../components/feedback.tsx';
import { setUnauthorizedHandler } from '../lib/api-client.ts';
import { queryClient } from '../lib/query-client.ts';
import { signInPath } from '../lib/session.ts';
import { requireSession } from './require-session.ts';
import { AppLayout } from './routes/app-layout.tsx';

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
    loader: async (args) => {
      await requireSession(args);
      return null;
    },
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
