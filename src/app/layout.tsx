import { LogOut, Menu, X } from 'lucide-react';
import { useState } from 'react';
import { NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { ROLE_LABELS, type User } from '@shared/schemas/auth';
import { Logo } from '@/components/logo';
import { Spinner } from '@/components/spinner';
import { Alert } from '@/components/alert';
import { navFor } from '@/config/nav';
import { paths } from '@/config/paths';
import { useMe } from '@/lib/me';
import { useSignOut } from '@/features/auth/api/sign-out';

/**
 * The role's navigation. From tablet width up it stands beside the page; on a phone it is folded behind the menu
 * button of the top bar and opens over the page (`open`), closing again when a page is chosen.
 */
function Sidebar({ user, open, onClose }: { user: User; open: boolean; onClose: () => void }) {
  const signOut = useSignOut();
  const navigate = useNavigate();
  return (
    <aside
      id="main-menu"
      className={`${open ? 'fixed inset-0 z-40 flex overflow-y-auto' : 'hidden'} flex-col bg-walnut-900 text-parchment-100 md:static md:flex md:w-52 md:shrink-0 lg:w-60`}
    >
      <div className="flex items-center gap-2.5 px-5 py-5">
        <Logo />
        <span className="font-serif text-xl font-semibold tracking-wide text-parchment-50">Shellwright</span>
        <button type="button" onClick={onClose} className="ml-auto rounded-md p-2 text-parchment-200 hover:bg-walnut-800 md:hidden" aria-label="Close the menu">
          <X className="h-5 w-5" aria-hidden />
        </button>
      </div>
      <nav aria-label="Main" className="flex-1 px-3">
        <ul className="space-y-0.5">
          {navFor(user.role).map(({ to, label, icon: Icon }) => (
            <li key={to}>
              <NavLink
                to={to}
                end={to === paths.home}
                onClick={onClose}
                className={({ isActive }) =>
                  `flex items-center gap-3 rounded-md px-3 py-3 text-base md:py-2 md:text-sm transition-colors ${
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
  const [menuOpen, setMenuOpen] = useState(false);
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
    <div className="min-h-screen md:flex">
      <header className="sticky top-0 z-30 flex items-center gap-2.5 bg-walnut-900 px-4 py-2 text-parchment-50 md:hidden">
        <Logo />
        <span className="font-serif text-lg font-semibold tracking-wide">Shellwright</span>
        <button
          type="button"
          onClick={() => setMenuOpen(true)}
          aria-expanded={menuOpen}
          aria-controls="main-menu"
          className="ml-auto inline-flex items-center gap-2 rounded-md px-3 py-2 text-parchment-100 hover:bg-walnut-800"
        >
          <Menu className="h-5 w-5" aria-hidden /> Menu
        </button>
      </header>
      <Sidebar user={me.data} open={menuOpen} onClose={() => setMenuOpen(false)} />
      <main className="min-w-0 flex-1 px-4 py-5 md:px-6 lg:px-8 lg:py-7">
        <Outlet />
      </main>
    </div>
  );
}
