import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Logo } from '@/components/logo';
import { paths } from '@/config/paths';

/** The signed-out pages' frame: the name, a title and its introduction, the page, and the way back to sign-in. */
export function Frame({ title, intro, children, wide = false }: { title: string; intro: ReactNode; children: ReactNode; wide?: boolean }) {
  return (
    <div className="flex min-h-screen items-start justify-center bg-parchment-50 px-4 py-10 sm:items-center sm:px-6">
      <main className={`w-full ${wide ? 'max-w-xl' : 'max-w-sm'} space-y-5`}>
        <div className="flex items-center gap-2">
          <Logo />
          <span className="font-serif text-xl font-semibold">Shellwright</span>
        </div>
        <div>
          <h1 className="text-3xl font-semibold text-walnut-900">{title}</h1>
          <p className="mt-1 text-sm text-walnut-600">{intro}</p>
        </div>
        {children}
        <p className="text-sm">
          <Link to={paths.signIn} className="text-walnut-700 underline decoration-walnut-300 underline-offset-2 hover:text-walnut-900">
            Back to sign-in
          </Link>
        </p>
      </main>
    </div>
  );
}
