import { useEffect, useRef } from 'react';
import { NavLink, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { signOut } from '../../features/auth/api/sign-in.ts';
import { CAN, useSession } from '../../lib/session.ts';
import type { Role } from '../../types/api.ts';

const ROLE_LABEL: Record<Role, string> = { installer: 'Installer', lead: 'Lead engineer', auditor: 'Auditor', admin: 'Admin' };

function navClass({ isActive }: { isActive: boolean }) {
  return `rounded-md px-3 py-1.5 font-medium transition-colors ${isActive ? 'bg-white/12 text-white shadow-[inset_0_-2px_0_var(--color-weir-500)]' : 'text-ink-200 hover:bg-white/8 hover:text-white'}`;
}

export function AppLayout() {
  const session = useSession();
  const navigate = useNavigate();
  const navigation = useNavigation();
  const role = session?.user.role;
  const { pathname } = useLocation();
  const shownPath = useRef(pathname);
  // After moving to another page, keyboard and screen-reader users start at its content.
  useEffect(() => {
    if (shownPath.current === pathname) return;
    shownPath.current = pathname;
    document.getElementById('main')?.focus();
  }, [pathname]);

  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">Skip to content</a>
      <header className="bg-ink-900 text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3 sm:px-6">
          <NavLink to="/sites" className="flex items-center gap-2 rounded" aria-label="Weir, sites">
            <img src="/weir-mark.svg" alt="" className="size-8" />
            <span className="text-lead font-semibold tracking-wide">Weir</span>
          </NavLink>
          <nav aria-label="Main" className="flex flex-1 flex-wrap items-center gap-1">
            <NavLink to="/sites" className={navClass}>Sites</NavLink>
            {CAN.readChangeLog(role) && <NavLink to="/change-log" className={navClass}>Change log</NavLink>}
            {CAN.manageAccounts(role) && <NavLink to="/accounts" className={navClass}>Accounts</NavLink>}
          </nav>
          {session && (
            <div className="flex items-center gap-3 text-caption">
              <span className="text-right leading-tight">
                <span className="block font-medium text-white">{session.user.name}</span>
                <span className="block text-ink-300">{ROLE_LABEL[session.user.role] ?? session.user.role}</span>
              </span>
              <button
                type="button"
                className="rounded-md border border-ink-600 px-2.5 py-1.5 font-medium text-ink-100 hover:border-ink-300 hover:text-white"
                onClick={() => {
                  signOut();
                  navigate('/sign-in', { replace: true });
                }}
              >
                Sign out
              </button>
            </div>
          )}
        </div>
        <div className={`h-0.5 bg-weir-500 transition-opacity ${navigation.state === 'loading' ? 'animate-pulse opacity-100' : 'opacity-0'}`} aria-hidden="true" />
      </header>
      <main id="main" tabIndex={-1} className="outline-none focus-visible:outline-none mx-auto max-w-7xl px-4 py-6 sm:px-6 sm:py-8">
        <Outlet />
      </main>
    </div>
  );
}
