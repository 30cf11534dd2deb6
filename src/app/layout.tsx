import { LogOut } from 'lucide-react';
import { NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { ROLE_LABELS, type User } from '@shared/schemas/auth';
import { Logo } from '@/components/logo';
import { Spinner } from '@/components/spinner';
import { Alert } from '@/components/alert';
import { navFor } from '@/config/nav';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';

function Sidebar({ user }: { user: User }) {
  const signOut = useSignOut();
  const navigate = useNavigate();
  return (
    <aside className="flex w-60 shrink-0 flex-col bg-walnut-900 text-parchment-100">
      <div className="flex items-center gap-2.5 px-5 py-5">
        <Logo />
        <span className="font-serif text-xl font-semibold tracking-wide text-parchment-50">Shellwright</span>
      </div>
      <nav aria-label="Main" className="flex-1 px-3">
        <ul className="space-y-0.5">
          {navFor(user.role).map(({ to, label, icon: Icon }) => (
            <li key={to}>
              <NavLink
                to={to}
                end={to === paths.home}
                className={({ isActive }) =>
                  `flex items-center gap-3 rounded-md px-3 py-2 text-sm transition-colors ${
                    isActive ? 'bg-amber-400 font-semibold text-walnut-950' : 'text-parchment-200 hover:bg-walnut-800 hover:text-parchment-50'
                  }`
                }
              >
                <Icon className="h-4 w-4" aria-hidden />
                {label}
              </NavLink>
            </li>
          ))}
        </ul>
      </nav>
      <div className="border-t border-walnut-700 px-5 py-4 text-sm">
        <p className="font-medium text-parchment-50" data-testid="current-user">
          {user.name}
        </p>
        <p className="text-parchment-300" data-testid="current-role">
          {ROLE_LABELS[user.role]}
        </p>
        <button
          type="button"
          onClick={() => signOut.mutate(undefined, { onSettled: () => navigate(paths.signIn) })}
          className="mt-3 inline-flex items-center gap-2 rounded-md px-2 py-1 text-parchment-200 hover:bg-walnut-800 hover:text-parchment-50"
        >
          <LogOut className="h-4 w-4" aria-hidden /> Sign out
        </button>
      </div>
    </aside>
  );
}

/** The signed-in frame: navigation for the user's role beside the page. Signed-out visitors go to sign-in. */
export function AppLayout() {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <Spinner label="Opening Shellwright…" />;
  if (me.isError) {
    return (
      <div className="mx-auto max-w-lg p-10">
        <Alert tone="error" title="Shellwright cannot reach its server">
          {me.error.message} Reload the page in a moment.
        </Alert>
      </div>
    );
  }
  if (!me.data) {
    const next = location.pathname + location.search;
    return <Navigate to={`${paths.signIn}${next !== '/' ? `?next=${encodeURIComponent(next)}` : ''}`} replace />;
  }
  return (
    <div className="flex min-h-screen">
      <Sidebar user={me.data} />
      <main className="min-w-0 flex-1 px-8 py-7">
        <Outlet />
      </main>
    </div>
  );
}
