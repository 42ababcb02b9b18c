import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { getSession, safeNext } from '../../lib/session.ts';

export function loader({ request }: LoaderFunctionArgs) {
  const next = new URL(request.url).searchParams.get('next');
  if (getSession()) throw redirect(safeNext(next));
  return null;
}

export function Component() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = safeNext(params.get('next'));
  const notice = params.get('reason') === 'expired'
    ? 'Your session has ended. Sign in again and you will be taken back to the page you were on.'
    : params.get('next') ? 'Sign in to continue.' : null;

  return (
    <main className="grid min-h-screen place-items-center bg-ink-900 px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 flex items-center gap-3 text-white">
          <img src="/weir-mark.svg" alt="" className="size-10" />
          <div>
            <p className="text-title font-semibold leading-tight">Weir</p>
            <p className="text-caption text-ink-300">Export-limit configurations, reviewed</p>
          </div>
        </div>
        <div className="rounded-xl bg-white p-6 shadow-lg shadow-ink-950/30">
          <h1 className="mb-4 text-title font-semibold text-ink-950">Sign in</h1>
          <SignInForm notice={notice} onSignedIn={() => navigate(next, { replace: true })} />
        </div>
        <p className="mt-4 text-caption text-ink-300">Accounts are made by an admin. Ask yours if you cannot sign in.</p>
      </div>
    </main>
  );
}
