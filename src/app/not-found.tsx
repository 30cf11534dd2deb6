import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';

export function NotFound() {
  return (
    <div className="mx-auto max-w-xl py-16 text-center">
      <p className="font-serif text-6xl text-amber-500">404</p>
      <h1 className="mt-3 text-2xl font-semibold text-walnut-900">No such page</h1>
      <p className="mt-2 text-walnut-600">The address may be mistyped, or the page may have moved.</p>
      <Link to={paths.home} className="mt-6 inline-block rounded-md bg-walnut-800 px-4 py-2 text-sm font-medium text-parchment-50 hover:bg-walnut-700">
        Back to the overview
      </Link>
    </div>
  );
}
